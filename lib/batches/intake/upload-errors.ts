/**
 * What the browser says when an upload fails. The upload library reports a store it could not
 * reach as INTERNAL_CLIENT_ERROR ("… report this to UploadThing") and an upload cut off midway
 * as UPLOAD_FAILED with the code as its message (its plain client: FetchError); neither tells a provider what happened or what
 * to do, so both get the API's wording. The app's own refusals (not admitted, too large, closed
 * study) keep their messages. Safe for client components.
 */
export const STORE_DOWN_MESSAGE =
  "The file store could not be reached, or it broke off the upload, so the file was not stored. Nothing was recorded; try again in a moment.";

/** Said when the database fails while an upload is recorded (API and browser uploads alike). */
export const DB_DOWN_MESSAGE =
  "The database could not be reached, so the batch was not recorded (the stored file was removed again). Nothing was recorded; try again in a moment.";

const STORE_CODES = new Set(["INTERNAL_CLIENT_ERROR", "UPLOAD_FAILED", "INTERNAL_SERVER_ERROR"]);

/** The message to show for a failed upload, from the library's error code and message. */
export function uploadErrorMessage(e: { name?: string; code?: string; message?: string }): string {
  const message = (e.message ?? "").trim();
  if (
    e.name === "FetchError" ||
    (e.code && STORE_CODES.has(e.code)) ||
    !message ||
    message === e.code ||
    /uploadthing/i.test(message)
  )
    return STORE_DOWN_MESSAGE;
  return message;
}
