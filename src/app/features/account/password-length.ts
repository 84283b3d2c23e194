import type { AbstractControl, ValidationErrors } from '@angular/forms';

/** The server's password rule (8–128 code points), checked as the user types. */
export function passwordLength(control: AbstractControl<string>): ValidationErrors | null {
  const length = [...(control.value ?? '')].length;
  if (length === 0) return null;
  if (length < 8) return { passwordLength: `At least 8 characters (${length} so far).` };
  if (length > 128) return { passwordLength: `At most 128 characters (${length} now).` };
  return null;
}
