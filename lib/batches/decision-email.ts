/** The decision e-mail to a provider: plain text and HTML, with every comment and the link. */
import { escapeHtml } from "@/lib/mail";

export type DecisionEmailInput = {
  decision: "accept" | "bounce";
  recipientName: string;
  studyTitle: string;
  batchTitle: string;
  organisationName: string;
  version: number;
  decidedBy: string;
  comment: string;
  findingComments: { code: string; columns: string[]; comment: string; message: string }[];
  link: string;
};

const esc = escapeHtml;

export function decisionEmail(m: DecisionEmailInput): { subject: string; text: string; html: string } {
  const verb = m.decision === "accept" ? "accepted" : "bounced";
  const subject = `${m.studyTitle}: "${m.batchTitle}" version ${m.version} ${verb}`;
  const lead =
    m.decision === "accept"
      ? `${m.decidedBy} accepted version ${m.version} of "${m.batchTitle}" (${m.organisationName}) for the study "${m.studyTitle}". It is now part of the study's pool.`
      : `${m.decidedBy} bounced version ${m.version} of "${m.batchTitle}" (${m.organisationName}) for the study "${m.studyTitle}". Please fix what the comments below describe and upload a new version of the batch.`;
  const text = [
    `Hello ${m.recipientName},`,
    "",
    lead,
    "",
    ...(m.comment ? ["Comment:", m.comment, ""] : []),
    ...(m.findingComments.length
      ? [
          "Comments on findings:",
          ...m.findingComments.map(
            (f) =>
              `- ${f.code}${f.columns.length ? ` (${f.columns.join(", ")})` : ""}: ${f.comment}${f.message ? `\n  Finding: ${f.message}` : ""}`,
          ),
          "",
        ]
      : []),
    `The report: ${m.link}`,
    ...(m.decision === "bounce"
      ? ["From the report you can download the rows at fault and upload the corrected file as a new version."]
      : []),
    "",
    "— Tributary",
  ].join("\n");
  const html = `<!doctype html><html><body style="font-family:sans-serif;color:#12262E;line-height:1.5">
<p>Hello ${esc(m.recipientName)},</p>
<p>${esc(lead)}</p>
${m.comment ? `<h3 style="margin-bottom:4px">Comment</h3><p style="white-space:pre-wrap">${esc(m.comment)}</p>` : ""}
${m.findingComments.length ? `<h3 style="margin-bottom:4px">Comments on findings</h3><ul>${m.findingComments.map((f) => `<li><code>${esc(f.code)}</code>${f.columns.length ? ` (<code>${esc(f.columns.join(", "))}</code>)` : ""}: ${esc(f.comment)}${f.message ? `<br><span style="color:#6B6354">Finding: ${esc(f.message)}</span>` : ""}</li>`).join("")}</ul>` : ""}
<p><a href="${esc(m.link)}" style="color:#1F6F78">Open the readiness report</a></p>
${m.decision === "bounce" ? "<p>From the report you can download the rows at fault and upload the corrected file as a new version.</p>" : ""}
<p style="color:#6B6354">— Tributary</p>
</body></html>`;
  return { subject, text, html };
}
