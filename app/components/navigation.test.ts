import { describe, expect, it } from "vitest";
import { currentNavItem, navFor } from "./navigation";
import { tasksFor } from "./role-home";

describe("the menu and the home page follow the access table", () => {
  it("gives the administrator accounts and settings but no reports", () => {
    const menu = navFor(["admin"]).map((item) => item.to);
    expect(menu).toEqual(["/", "/admin/users", "/admin/settings", "/apparatus", "/records"]);
    expect(tasksFor("admin").some((task) => task.to?.startsWith("/events"))).toBe(false);
  });

  it("takes the records clerk to the public-records queue from the menu", () => {
    expect(navFor(["records"]).map((item) => item.to)).toEqual(["/", "/events", "/records"]);
    expect(navFor(["officer"]).map((item) => item.to)).not.toContain("/records");
  });

  it("links the mail outbox for the administrator where it exists, in demo mode", () => {
    expect(navFor(["admin"], true).map((item) => item.to)).toContain("/admin/outbox");
    expect(navFor(["admin"], false).map((item) => item.to)).not.toContain("/admin/outbox");
    expect(navFor(["chief"], true).map((item) => item.to)).not.toContain("/admin/outbox");
  });

  it("gives a person with two roles the menu items of both, once each", () => {
    const menu = navFor(["admin", "records"]).map((item) => item.to);
    expect(menu).toContain("/events");
    expect(menu).toContain("/admin/users");
    expect(new Set(menu).size).toBe(menu.length);
  });

  it("offers the review queue to reviewers only, and filing to officers only", () => {
    expect(tasksFor("environmental").map((task) => task.to)).toContain("/review");
    expect(tasksFor("officer").map((task) => task.to)).not.toContain("/review");
    expect(tasksFor("officer").map((task) => task.to)).toContain("/events/new");
    expect(tasksFor("chief").map((task) => task.to)).not.toContain("/events/new");
  });
});

describe("the current menu item", () => {
  const officer = navFor(["officer"]).map((item) => item.to);
  const reviewer = navFor(["environmental"]).map((item) => item.to);

  it("is New report alone on the new-report page, Events on an event's page", () => {
    expect(officer).toEqual(expect.arrayContaining(["/events", "/events/new"]));
    expect(currentNavItem(officer, "/events/new", "")).toBe("/events/new");
    expect(currentNavItem(officer, "/events/12", "")).toBe("/events");
    expect(currentNavItem(officer, "/events", "?kind=training")).toBe("/events");
    expect(currentNavItem(officer, "/", "")).toBe("/");
    expect(currentNavItem(officer, "/profile", "")).toBeNull();
  });

  it("is the review queue on its own page, the events list elsewhere", () => {
    expect(reviewer).toContain("/review");
    expect(currentNavItem(reviewer, "/review", "")).toBe("/review");
    expect(currentNavItem(reviewer, "/events", "?status=filed")).toBe("/events");
  });

  it("prefers a link with a query on its own query, and its plain sibling otherwise", () => {
    const links = ["/", "/events", "/events?status=filed"];
    expect(currentNavItem(links, "/events", "?status=filed")).toBe("/events?status=filed");
    expect(currentNavItem(links, "/events", "?status=draft")).toBe("/events");
    expect(currentNavItem(links, "/events/12", "")).toBe("/events");
  });
});
