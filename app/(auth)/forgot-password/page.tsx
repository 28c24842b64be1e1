import { ForgotPasswordForm } from "@/components/settings/link-forms";
import { requestResetAction } from "../link-actions";

export const metadata = { title: "Forgot your password" };

export default function ForgotPasswordPage() {
  return (
    <>
      <h1 className="text-2xl font-semibold">Forgot your password?</h1>
      <p className="mt-1 mb-6 text-md text-ink-soft">
        Enter your e-mail address; we send a link to choose a new password.
      </p>
      <ForgotPasswordForm request={requestResetAction} />
    </>
  );
}
