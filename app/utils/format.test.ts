import { afterEach, describe, expect, it, vi } from "vitest";
import {
  formatDate,
  formatDateTime,
  formatMinutes,
  isoDateTime,
  keepUnitsTogether,
  keepUnitsTogetherInHtml,
  round,
} from "./format";

const NBSP = "\u00a0";

/**
 * The instants are fixed in UTC; the expected strings follow from them alone. Pacific/Honolulu is
 * UTC−10 all year and Asia/Tokyo UTC+9 all year (IANA time zone database, neither observes daylight
 * saving), so each instant falls on a different calendar day in those zones than in UTC: a formatter
 * that used the process's zone would give a different string under one of them.
 */
const ZONES = [
  { tz: "Pacific/Honolulu", offsetMinutes: 600 },
  { tz: "Asia/Tokyo", offsetMinutes: -540 },
  { tz: "UTC", offsetMinutes: 0 },
];
const CASES = [
  // 23:30 UTC is 13:30 the same day in Honolulu and 08:30 the next day in Tokyo.
  { instant: "2026-12-02T23:30:00.000Z", date: "2 Dec 2026", dateTime: "2 Dec 2026, 23:30 UTC" },
  // 00:10 UTC on 1 September is still 31 August in Honolulu.
  { instant: "2026-09-01T00:10:00.000Z", date: "1 Sep 2026", dateTime: "1 Sep 2026, 00:10 UTC" },
  // New Year in UTC is still the old year in Honolulu.
  { instant: "2027-01-01T05:07:00.000Z", date: "1 Jan 2027", dateTime: "1 Jan 2027, 05:07 UTC" },
];

const savedTz = process.env.TZ;
afterEach(() => {
  if (savedTz === undefined) delete process.env.TZ;
  else process.env.TZ = savedTz;
});

describe("dates read the same in every time zone", () => {
  for (const { tz, offsetMinutes } of ZONES) {
    it(`under TZ=${tz}`, () => {
      process.env.TZ = tz;
      // The zone is really in force for this process (Node re-reads TZ when it is assigned).
      expect(new Date("2026-12-02T23:30:00.000Z").getTimezoneOffset()).toBe(offsetMinutes);
      for (const c of CASES) {
        expect(formatDate(c.instant)).toBe(c.date);
        expect(formatDate(new Date(c.instant))).toBe(c.date);
        expect(formatDate(Date.parse(c.instant))).toBe(c.date);
        expect(formatDateTime(c.instant)).toBe(c.dateTime);
        expect(isoDateTime(new Date(c.instant))).toBe(c.instant);
      }
    });
  }

  it("names all twelve months with the same three letters", () => {
    const months = Array.from({ length: 12 }, (_, m) => formatDate(Date.UTC(2026, m, 15)).split(" ")[1]);
    expect(months).toEqual(["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"]);
  });
});

describe("formatMinutes: minutes under 90, hours and minutes from 90", () => {
  // The product's one rule for a guide's time (common practice for durations in instructions).
  it.each([
    [0, "0 min"],
    [5, "5 min"],
    [45, "45 min"],
    [60, "60 min"],
    [89, "89 min"],
    [90, "1 h 30 min"],
    [120, "2 h"],
    [125, "2 h 5 min"],
    [180, "3 h"],
    [615, "10 h 15 min"],
  ])("%i minutes → %s", (minutes, expected) => {
    expect(formatMinutes(minutes)).toBe(expected);
  });

  it("never shows a decimal hour", () => {
    for (let m = 0; m <= 24 * 60; m++) expect(formatMinutes(m)).toMatch(/^(\d+ min|\d+ h|\d+ h \d+ min)$/);
  });
});

describe("round", () => {
  it.each([
    // en-GB groups thousands with a comma and marks decimals with a point (CLDR en-GB number symbols).
    [1234.56, 1, "1,234.6"],
    [0.19245, 3, "0.192"],
    [14.16666, 2, "14.17"],
    [2, 1, "2"],
    [25.35, 0, "25"],
    [-3.25, 1, "-3.3"],
  ])("round(%d, %i) = %s", (value, digits, expected) => {
    expect(round(value, digits)).toBe(expected);
  });

  it("reads the same under another time zone and builds no formatter per call", () => {
    const before = [round(1234.56, 1), round(0.19245, 3)];
    process.env.TZ = "Asia/Tokyo";
    const spy = vi.spyOn(Intl, "NumberFormat");
    const after = [round(1234.56, 1), round(0.19245, 3)];
    for (let i = 0; i < 100; i++) round(i / 7, i % 4);
    expect(spy).not.toHaveBeenCalled();
    spy.mockRestore();
    expect(after).toEqual(before);
  });
});

describe("keepUnitsTogether", () => {
  it("joins a number to the unit after it with a no-break space", () => {
    expect(keepUnitsTogether("a 20 A fuse on 12 AWG wire, 25.4 N·m, 105 °C, 1.6 %")).toBe(
      `a 20${NBSP}A fuse on 12${NBSP}AWG wire, 25.4${NBSP}N·m, 105${NBSP}°C, 1.6${NBSP}%`,
    );
    expect(keepUnitsTogether("150 mm away, 2 h 30 min")).toBe(`150${NBSP}mm away, 2${NBSP}h 30${NBSP}min`);
  });

  it("leaves words that only start like a unit alone", () => {
    expect(keepUnitsTogether("step 3 Attach the 2 Mounts")).toBe("step 3 Attach the 2 Mounts");
    expect(keepUnitsTogether("in 2 steps")).toBe("in 2 steps");
  });

  it("changes the text of HTML, never its tags", () => {
    expect(keepUnitsTogetherInHtml('<p title="5 A">a 5 A fuse</p><a href="/x?y=5 A">10 mm</a>')).toBe(
      `<p title="5 A">a 5${NBSP}A fuse</p><a href="/x?y=5 A">10${NBSP}mm</a>`,
    );
  });
});
