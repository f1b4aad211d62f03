import { describe, expect, it } from "vitest";
import { AppError } from "./app-error";
import { actionError, apiCall, appErrorResponse, attempt, formReply, pageCall } from "./http.server";

/** The one place an AppError becomes an answer. The body is the API convention of DEVELOPERS.md. */
describe("mapping an AppError", () => {
  it("answers an API call with the one error body, its status, details beside `error` and its headers", async () => {
    const e = new AppError(429, "rate_limited", "Too many ballots.", { fieldErrors: { ballot: ["wait"] }, details: { current: { version: 2 } }, headers: { "Retry-After": "30" } });
    const res = appErrorResponse(e);
    expect(res.status).toBe(429);
    // Retry-After in delay-seconds (RFC 9110, section 10.2.3); no-store as every API answer.
    expect(res.headers.get("retry-after")).toBe("30");
    expect(res.headers.get("cache-control")).toBe("no-store");
    expect(await res.json()).toEqual({ error: { status: 429, code: "rate_limited", message: "Too many ballots.", fieldErrors: { ballot: ["wait"] } }, current: { version: 2 } });
  });

  it("throws the answer from apiCall and lets any other failure through untouched", async () => {
    const thrown = await apiCall(async () => {
      throw new AppError(404, "not_found", "That entry was not found.");
    }).catch((x: unknown) => x);
    expect(thrown).toBeInstanceOf(Response);
    expect((thrown as Response).status).toBe(404);
    const fault = new TypeError("a bug");
    await expect(apiCall(async () => Promise.reject(fault))).rejects.toBe(fault);
    await expect(attempt(async () => Promise.reject(fault))).rejects.toBe(fault);
    await expect(pageCall(async () => Promise.reject(fault))).rejects.toBe(fault);
  });

  it("hands a page action the refusal as a value, and a form its field errors or its message", async () => {
    const out = await attempt(async () => {
      throw new AppError(409, "handle_taken", "Taken.", { fieldErrors: { handle: ["Taken."] } });
    });
    expect(out.ok).toBe(false);
    const replies: unknown[] = [];
    const submission = { reply: (o?: unknown) => (replies.push(o), "reply") };
    if (!out.ok) formReply(submission, out.error);
    formReply(submission, new AppError(409, "frozen", "Nothing was saved.", { fieldErrors: { deadline: ["Fixed."] }, formErrors: ["Nothing was saved."] }));
    formReply(submission, new AppError(502, "refund_refused", "The payment service refused."));
    expect(replies).toEqual([
      { fieldErrors: { handle: ["Taken."] } },
      { fieldErrors: { deadline: ["Fixed."] }, formErrors: ["Nothing was saved."] },
      { formErrors: ["The payment service refused."] },
    ]);
    expect(actionError(new AppError(400, "invalid_body", "x", { fieldErrors: { until: ["Give the end as a date and time."] } }))).toEqual({ error: "Give the end as a date and time.", field: "until" });
    await expect(attempt(async () => 7)).resolves.toEqual({ ok: true, value: 7 });
  });

  it("turns a page's refusal into a thrown data() with its status", async () => {
    const thrown = (await pageCall(async () => {
      throw new AppError(410, "expired", "This invitation has expired.");
    }).catch((x: unknown) => x)) as { type?: string; data?: unknown; init?: { status?: number } };
    expect(thrown.type).toBe("DataWithResponseInit");
    expect(thrown.init?.status).toBe(410);
    expect(thrown.data).toEqual({ message: "This invitation has expired." });
  });
});
