/** The body of every error the API sends. */
export interface ApiErrorBody {
  error: {
    /** Stable, machine-readable, kebab-case: 'not-signed-in', 'forbidden', 'validation-failed', … */
    code: string;
    /** One or two sentences for a person: what is wrong and what to do. */
    message: string;
    /** Field → message, for form errors. */
    fields?: Record<string, string>;
  };
}
