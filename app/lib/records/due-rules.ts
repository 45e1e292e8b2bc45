/**
 * The due-date rules an agency can choose for public-records requests, without the calendar code
 * (so the settings form can list them in the browser). The law of the agency's state governs.
 */

export type DueRule = {
  label: string;
  /** Days to answer, business days unless `calendarDays`. */
  days: number;
  /** Days an extension may add (0: the rule gives none). */
  extensionDays: number;
  calendarDays: boolean;
  source: string;
};

/** The rules an agency can choose; the law of its state governs, not this table. */
export const RECORDS_DUE_RULES = {
  federal: {
    label: "Federal FOIA: 20 working days",
    days: 20,
    extensionDays: 10,
    calendarDays: false,
    // 5 U.S.C. 552(a)(6)(A) (20 days); 552(a)(6)(B)(i) (10 more in unusual circumstances).
    source: "5 U.S.C. 552(a)(6)",
  },
  illinois: {
    label: "Illinois: 5 business days (+5)",
    days: 5,
    extensionDays: 5,
    calendarDays: false,
    source: "5 ILCS 140/3",
  },
  pennsylvania: {
    label: "Pennsylvania: 5 business days",
    days: 5,
    extensionDays: 0,
    calendarDays: false,
    source: "65 P.S. §67.901",
  },
  colorado: {
    label: "Colorado: 3 working days (+7)",
    days: 3,
    extensionDays: 7,
    calendarDays: false,
    source: "C.R.S. 24-72-203",
  },
  california: {
    label: "California: 10 calendar days (+14)",
    days: 10,
    extensionDays: 14,
    calendarDays: true,
    source: "Cal. Gov. Code §7922.535",
  },
} as const satisfies Record<string, DueRule>;

export type DueRuleKey = keyof typeof RECORDS_DUE_RULES;
export const DUE_RULE_KEYS = Object.keys(RECORDS_DUE_RULES) as DueRuleKey[];

export function isDueRuleKey(value: unknown): value is DueRuleKey {
  return typeof value === "string" && value in RECORDS_DUE_RULES;
}
