/** Within this many business days of the due date a request is shown as due soon (the product's own choice). */
export const DUE_SOON_BUSINESS_DAYS = 2;
