import type { Role } from "./roles";

/** Who may read usage reports and their lists. */
export const REPORT_READERS: Role[] = ["officer", "environmental", "chief", "records", "admin"];
/** Who may start and file a report. */
export const REPORT_AUTHORS: Role[] = ["officer"];
/** Who may accept or return a filed report. */
export const REPORT_REVIEWERS: Role[] = ["environmental", "chief"];
/** Who may file a revision of an accepted report. */
export const REPORT_REVISERS: Role[] = ["officer", "environmental", "chief"];
