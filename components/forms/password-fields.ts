import { minimumPasswordLength } from "@/lib/auth/password";
import type { FormFieldSpec } from "./action-form";

/** The two fields for choosing a password (typed twice), with the length rule the actions check. */
export function newPasswordFields(name: string, label: string): FormFieldSpec[] {
  return [
    { name, label, type: "password", autoComplete: "new-password", hint: `At least ${minimumPasswordLength} characters.` },
    { name: "repeatPassword", label: `${label} again`, type: "password", autoComplete: "new-password" },
  ];
}
