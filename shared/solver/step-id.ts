/**
 * Makes an id safe inside an HTML anchor and a URL fragment: letters, digits, '_' and '-' stay,
 * anything else becomes '_'. Step ids are built from these parts, e.g. "case-D/joint-C".
 */
export function stepIdPart(raw: string): string {
  return raw.replace(/[^A-Za-z0-9_-]/g, '_');
}
