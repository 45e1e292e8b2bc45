import { describe, expect, it } from "vitest";
import { ATTACHMENT_MAX_MB_CEILING } from "./agency-settings-form";
import {
  ATTACHMENT_BODY_CEILING_BYTES,
  FORM_BODY_MAX_BYTES,
  JSON_BODY_MAX_BYTES,
  requestBodyLimit,
  UPLOAD_BODY_MAX_BYTES,
} from "./request-limits";
import { SAFETY_SHEET_MAX_BYTES } from "./catalogue/product-form";
import { MAX_LAYER_BYTES } from "./geo/layers";

describe("the body limit of each route", () => {
  it("lets the two upload pages take their file and the form around it", () => {
    expect(requestBodyLimit("/products/new")).toBe(UPLOAD_BODY_MAX_BYTES);
    expect(requestBodyLimit("/products/12")).toBe(UPLOAD_BODY_MAX_BYTES);
    expect(requestBodyLimit("/geography")).toBe(UPLOAD_BODY_MAX_BYTES);
    expect(requestBodyLimit("/geography.data")).toBe(UPLOAD_BODY_MAX_BYTES);
    expect(requestBodyLimit("/products/12.data")).toBe(UPLOAD_BODY_MAX_BYTES);
    expect(UPLOAD_BODY_MAX_BYTES).toBeGreaterThan(Math.max(SAFETY_SHEET_MAX_BYTES, MAX_LAYER_BYTES));
  });

  it("lets an attachment upload reach the route, which holds it to the agency's own setting", () => {
    expect(requestBodyLimit("/api/events/12/attachments")).toBe(ATTACHMENT_BODY_CEILING_BYTES);
    expect(ATTACHMENT_BODY_CEILING_BYTES).toBeGreaterThan(ATTACHMENT_MAX_MB_CEILING * 1024 * 1024);
    expect(requestBodyLimit("/api/events/12/attachments/3")).toBe(JSON_BODY_MAX_BYTES);
    expect(requestBodyLimit("/api/events/12")).toBe(JSON_BODY_MAX_BYTES);
    expect(requestBodyLimit("/attachments/3")).toBe(FORM_BODY_MAX_BYTES);
  });

  it("lets a test printout or a disposal manifest reach its route the same way", () => {
    expect(requestBodyLimit("/api/foam-tests/7/attachments")).toBe(ATTACHMENT_BODY_CEILING_BYTES);
    expect(requestBodyLimit("/api/stock/movements/9/attachments")).toBe(ATTACHMENT_BODY_CEILING_BYTES);
    expect(requestBodyLimit("/api/stock/movements")).toBe(JSON_BODY_MAX_BYTES);
    expect(requestBodyLimit("/api/foam-tests/compute")).toBe(JSON_BODY_MAX_BYTES);
    expect(requestBodyLimit("/stock/movements/9/attachments/2")).toBe(FORM_BODY_MAX_BYTES);
  });

  it("holds every other form and the JSON API to 1 MB", () => {
    expect(requestBodyLimit("/sign-in")).toBe(FORM_BODY_MAX_BYTES);
    expect(requestBodyLimit("/events/new")).toBe(FORM_BODY_MAX_BYTES);
    expect(requestBodyLimit("/products/12/safety-sheet")).toBe(FORM_BODY_MAX_BYTES);
    expect(requestBodyLimit("/products/12/safety-sheet.data")).toBe(FORM_BODY_MAX_BYTES);
    expect(requestBodyLimit("/geography/x")).toBe(FORM_BODY_MAX_BYTES);
    expect(requestBodyLimit("/api/totals")).toBe(JSON_BODY_MAX_BYTES);
    expect(FORM_BODY_MAX_BYTES).toBe(1024 * 1024);
  });
});
