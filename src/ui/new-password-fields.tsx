"use client";
/**
 * "New password" + "Confirm password", checked as you type (length rule, match) and again by
 * the server. Field names: `password`, `confirm`.
 */
import { useState } from "react";
import { MIN_PASSWORD_LENGTH as PASSWORD_MIN_LENGTH } from "@/src/server/auth/schema";
import { TextField } from "./field";

export function NewPasswordFields({ errors }: { errors: { password?: string[]; confirm?: string[] } }) {
  const [password, setPassword] = useState("");
  const [confirm, setConfirm] = useState("");
  const [touched, setTouched] = useState({ password: false, confirm: false });

  const tooShort = touched.password && password.length > 0 && password.length < PASSWORD_MIN_LENGTH;
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
        minLength={PASSWORD_MIN_LENGTH}
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        onBlur={() => setTouched((t) => ({ ...t, password: true }))}
        hint={`At least ${PASSWORD_MIN_LENGTH} characters.`}
        errors={tooShort ? [`Use at least ${PASSWORD_MIN_LENGTH} characters.`] : errors.password}
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
