import { describe, expect, it } from "vitest";
import { UploadStore } from "./upload-store";

const file = (name: string) => ({ fileName: name, bytes: 10, header: ["week"], rows: [["2025-01-06"]], rowNumbers: [2] });

describe("UploadStore", () => {
  it("gives an upload back to its uploader only, until it expires", () => {
    let now = 1_000;
    const store = new UploadStore({ ttlMs: 60_000, now: () => now });
    const upload = store.put("ana", file("a.csv"));
    expect(upload.expiresAt).toBe(61_000);
    expect(store.get(upload.id, "ana")?.fileName).toBe("a.csv");
    expect(store.get(upload.id, "bea")).toBeNull();
    now = 60_999;
    expect(store.get(upload.id, "ana")).not.toBeNull();
    now = 61_000;
    expect(store.get(upload.id, "ana")).toBeNull();
    expect(store.size).toBe(0);
  });

  it("keeps a few uploads per user, dropping the oldest", () => {
    let now = 0;
    const store = new UploadStore({ ttlMs: 60_000, maxPerUser: 2, now: () => now++ });
    const first = store.put("ana", file("1.csv"));
    const second = store.put("ana", file("2.csv"));
    const other = store.put("bea", file("b.csv"));
    const third = store.put("ana", file("3.csv"));
    expect(store.get(first.id, "ana")).toBeNull();
    expect(store.get(second.id, "ana")?.fileName).toBe("2.csv");
    expect(store.get(third.id, "ana")?.fileName).toBe("3.csv");
    expect(store.get(other.id, "bea")?.fileName).toBe("b.csv");
  });
});
