/**
 * The state every form action returns to `useActionState`: a discriminated union on `status`.
 * Pure types and constructors; safe on client and server.
 */
export type FieldErrors = Record<string, string[] | undefined>;

export type ActionState =
  | { status: "idle" }
  | { status: "error"; fieldErrors: FieldErrors; formError?: string }
  | { status: "success"; message?: string };

export const IDLE: ActionState = { status: "idle" };

export function fieldErrorsOf(state: ActionState): FieldErrors {
  return state.status === "error" ? state.fieldErrors : {};
}

export function formErrorOf(state: ActionState): string | undefined {
  return state.status === "error" ? state.formError : undefined;
}

export function successOf(state: ActionState): string | undefined {
  return state.status === "success" ? state.message : undefined;
}
