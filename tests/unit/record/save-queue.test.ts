import { describe, expect, it } from "vitest";
import { afterSaved, readStoredQueue, restoredInputs, restoredReasons, saveOutcome, saveRequestBody, storedQueueText, tokenOf, withoutSlot, withQueued, type Pending } from "@/components/record/save-queue";

const count = (value: string): Pending => ({ plotId: 7, key: "emergence_count@5", value, reason: null });
const died: Pending = { plotId: 7, key: "emergence_count@5", value: "", reason: "died" };
const slot = "7:emergence_count@5";

describe("the phone form's offline queue", () => {
  it("keeps only the latest value typed for a plot's field", () => {
    const q = withQueued(withQueued({}, count("4")), count("5"));
    expect(Object.keys(q)).toEqual([slot]);
    expect(q[slot]!.value).toBe("5");
  });

  it("a value saved while a newer one was typed leaves the newer one queued", () => {
    const q = withQueued({}, count("5"));
    expect(afterSaved(q, count("4"))).toEqual(q);
    expect(afterSaved(q, count("5"))).toEqual({});
  });

  it("a saved value does not clear a queued reason for the same field, and the other way round", () => {
    expect(afterSaved(withQueued({}, died), count(""))[slot]).toEqual(died);
    expect(afterSaved(withQueued({}, count("")), died)[slot]).toEqual(count(""));
    expect(tokenOf("", "died")).not.toBe(tokenOf("", null));
  });

  it("drops a refused value from the queue and leaves other fields queued", () => {
    const other: Pending = { plotId: 8, key: "quality", value: "5" };
    const q = withQueued(withQueued({}, count("x")), other);
    expect(withoutSlot(q, slot)).toEqual({ "8:quality": other });
  });

  it("stops retrying a value the server refused, and names the field's own message", () => {
    expect(saveOutcome({ ok: false, status: 400, slot, body: { error: "2 values need fixing.", fieldErrors: { [slot]: ["Counts are whole numbers."] } } })).toEqual({ kind: "refused", message: "Counts are whole numbers." });
    expect(saveOutcome({ ok: false, status: 409, slot, body: { error: "This data is locked." } })).toEqual({ kind: "refused", message: "This data is locked." });
    for (const status of [403, 404, 413, 415]) expect(saveOutcome({ ok: false, status, slot, body: {} }).kind).toBe("refused");
  });

  it("keeps a value for retrying when the server is unreachable, busy or the grower was signed out", () => {
    expect(saveOutcome({ ok: false, status: 503, slot })).toEqual({ kind: "retry", signedOut: false });
    expect(saveOutcome({ ok: false, status: 500, slot })).toEqual({ kind: "retry", signedOut: false });
    expect(saveOutcome({ ok: false, status: 401, slot })).toEqual({ kind: "retry", signedOut: true });
    expect(saveOutcome({ ok: true, status: 200, slot })).toEqual({ kind: "saved" });
  });

  it("sends an empty field as no value, with the reason when there is one", () => {
    expect(saveRequestBody({ trialId: 1, siteId: 2, item: died })).toEqual({ trialId: 1, siteId: 2, values: [{ plotId: 7, key: "emergence_count@5", value: null, missingReason: "died" }] });
    expect(saveRequestBody({ trialId: 1, siteId: 2, item: { plotId: 7, key: "quality", value: "6" } }).values[0]).toEqual({ plotId: 7, key: "quality", value: "6", missingReason: null });
  });

  it("survives a page reload through the device's storage, and an empty queue removes the stored entry", () => {
    const q = withQueued(withQueued({}, count("5")), { plotId: 9, key: "quality", value: "", reason: "weather" });
    expect(readStoredQueue(storedQueueText(q))).toEqual(q);
    expect(storedQueueText({})).toBeNull();
  });

  it("treats unreadable stored data as an empty queue", () => {
    for (const text of [null, "", "{not json", "null", "[1,2]", "42"]) expect(readStoredQueue(text)).toEqual({});
  });

  it("shows restored values in their fields, and a restored value clears a reason shown for its field", () => {
    const stored = withQueued(withQueued({}, count("5")), { plotId: 9, key: "quality", value: "", reason: "weather" });
    expect(restoredInputs({ [slot]: "3", "10:quality": "7" }, stored)).toEqual({ [slot]: "5", "9:quality": "", "10:quality": "7" });
    expect(restoredReasons({ [slot]: "died", "10:quality": "lost_label" }, stored)).toEqual({ "9:quality": "weather", "10:quality": "lost_label" });
  });
});
