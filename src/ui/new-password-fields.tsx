"use client";
/**
 * "New password" + "Confirm password", checked as you type with the server's own password rule
 * (NewPasswordSchema) and for a match, then again by the server. Field names: `password`, `confirm`.
 */
import { useState } from "react";
import { MIN_PASSWORD_LENGTH, NewPasswordSchema } from "@/src/server/auth/schema";
import { TextField } from "./field";

export function NewPasswordFields({ errors }: { errors: { password?: string[]; confirm?: string[] } }) {
  const [password, setPassword] = useState("");
  const [confirm, setConfirm] = useState("");
  const [touched, setTouched] = useState({ password: false, confirm: false });

  const passwordIssue = touched.password && password.length > 0 ? NewPasswordSchema.safeParse(password).error?.issues[0]?.message : undefined;
  const mismatch = touched.confirm && confirm.length > 0 && confirm !== password;

  return (
    <>
      <TextField
        id="password"
        name="password"
        label="New password"
        type="password"
        autoComplete="new-password"
        required
        minLength={MIN_PASSWORD_LENGTH}
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        onBlur={() => setTouched((t) => ({ ...t, password: true }))}
        hint={`At least ${MIN_PASSWORD_LENGTH} characters.`}
        errors={passwordIssue ? [passwordIssue] : errors.password}
      />
      <TextField
        id="confirm"
        name="confirm"
        label="Confirm password"
        type="password"
        autoComplete="new-password"
        required
        value={confirm}
        onChange={(e) => {
          setConfirm(e.target.value);
          setTouched((t) => ({ ...t, confirm: true }));
        }}
        errors={mismatch ? ["The passwords do not match."] : errors.confirm}
      />
    </>
  );
}
