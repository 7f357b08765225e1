/** The form-level message: an error (announced at once) or a confirmation. */
export default function FormAlert({ error, notice }: { error?: string | null; notice?: string | null }) {
  if (error) {
    return (
      <p role="alert" className="rounded-md border border-alarm-100 bg-alarm-50 px-3 py-2 text-sm text-alarm-700" data-testid="form-error">
        {error}
      </p>
    );
  }
  if (notice) {
    return (
      <p role="status" className="rounded-md border border-moss-100 bg-moss-50 px-3 py-2 text-sm text-moss-700" data-testid="form-notice">
        {notice}
      </p>
    );
  }
  return null;
}
