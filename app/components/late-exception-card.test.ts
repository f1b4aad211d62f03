import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { LateExceptionNotice } from "./LateExceptionCard";

describe("the late exception notice the crew and the jury read", () => {
  it("renders the end in the event's time zone, the reason and who granted it", () => {
    const html = renderToStaticMarkup(
      createElement(LateExceptionNotice, {
        exception: { until: "2027-06-12T21:30:00.000Z", reason: "power cut at table 12", grantedBy: "Ora Ganiser", grantedAt: "2027-06-12T20:10:00.000Z" },
        timeZone: "Europe/Berlin",
      }),
    );
    // 21:30 UTC is 23:30 in Berlin in June (CEST, UTC+2: IANA tz database through Intl)
    expect(html).toContain("12 Jun 2027, 23:30 CEST");
    expect(html).toContain("power cut at table 12");
    expect(html).toContain("granted by Ora Ganiser");
  });
});
