/**
 * What the upload page lists from the browser's check: the blockers and warnings (notes are for
 * the report), at most SHOWN_BEFORE_UPLOAD of them, and how many more there are, so the page
 * never drops findings without saying so.
 */
export const SHOWN_BEFORE_UPLOAD = 12;

export function beforeUploadList<F extends { severity: string }>(
  findings: readonly F[],
  shown = SHOWN_BEFORE_UPLOAD,
): { listed: F[]; more: number } {
  const serious = findings.filter((f) => f.severity !== "note");
  return { listed: serious.slice(0, shown), more: Math.max(0, serious.length - shown) };
}
