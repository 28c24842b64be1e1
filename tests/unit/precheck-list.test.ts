import { describe, expect, it } from "vitest";
import { beforeUploadList, SHOWN_BEFORE_UPLOAD } from "@/lib/batches/intake/precheck-list";

const finding = (severity: string, code: string) => ({ severity, code });

describe("the upload page's list of the browser check's findings", () => {
  it("lists blockers and warnings in their order and leaves notes to the report", () => {
    const { listed, more } = beforeUploadList([
      finding("note", "n1"),
      finding("blocker", "b1"),
      finding("warning", "w1"),
      finding("note", "n2"),
    ]);
    expect(listed.map((f) => f.code)).toEqual(["b1", "w1"]);
    expect(more).toBe(0);
  });

  it("lists at most SHOWN_BEFORE_UPLOAD and counts the rest, notes not counted", () => {
    const many = Array.from({ length: SHOWN_BEFORE_UPLOAD + 3 }, (_, i) =>
      finding(i % 2 ? "warning" : "blocker", `f${i}`),
    );
    const { listed, more } = beforeUploadList([...many, finding("note", "n")]);
    expect(listed).toHaveLength(SHOWN_BEFORE_UPLOAD);
    expect(listed[0]?.code).toBe("f0");
    expect(more).toBe(3);
  });

  it("at exactly the limit nothing is left over", () => {
    const exact = Array.from({ length: SHOWN_BEFORE_UPLOAD }, (_, i) => finding("warning", `w${i}`));
    expect(beforeUploadList(exact).more).toBe(0);
  });
});
