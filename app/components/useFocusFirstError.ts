// After a form comes back refused, focus goes to its first field marked invalid, so a screen reader
// reads that field's label and its error (aria-describedby), and a keyboard user is where the fix is.
// Without it, errors that appear beside the fields after a submit are not announced.
import { useEffect, useRef } from "react";

export function useFocusFirstError<F extends HTMLElement = HTMLFormElement>(result: unknown) {
  const form = useRef<F>(null);
  useEffect(() => {
    if (!result || typeof result !== "object" || (result as { ok?: unknown }).ok !== false) return;
    form.current?.querySelector<HTMLElement>('[aria-invalid="true"]')?.focus();
  }, [result]);
  return form;
}
