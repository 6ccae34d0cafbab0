import type { Metadata } from "next";
import { ForgotPasswordForm } from "./forgot-password-form";

export const metadata: Metadata = { title: "Forgot password" };

export default function ForgotPasswordPage() {
  return (
    <>
      <h1 className="mb-1 text-xl font-semibold text-ink-900">Forgot your password?</h1>
      <p className="mb-5 text-sm text-ink-600">Enter the e-mail of your account and we will send a link to choose a new password.</p>
      <ForgotPasswordForm />
    </>
  );
}
