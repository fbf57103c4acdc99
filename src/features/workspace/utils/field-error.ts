/** A form error said for a person: zod's wording for an empty number field becomes plain words. */
export function fieldErrorText(message: string | undefined): string | undefined {
  if (!message) return undefined;
  if (/received NaN|expected number/i.test(message)) return 'Enter a number.';
  return message;
}
