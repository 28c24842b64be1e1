/** E-mail: SMTP transport and the outbox (queue in a transaction, deliver with retries). */
export { createTransport, transport } from "./transport";
export {
  deliverOutbox,
  enqueueEmail,
  messageIdFor,
  retryDelayMs,
  runMailSender,
  type DeliverOptions,
  type DeliverResult,
  type EmailInput,
} from "./outbox";
export { escapeHtml } from "./html";
