// What a form shows: the values typed (sent back by a failed action) or the loader's, the errors
// beside their fields, and whether it is being sent.
import { useNavigation } from "react-router";

type Sent = { values: Record<string, string>; ok?: boolean; errors?: Record<string, string> };

export function useFormState(initial: Record<string, string>, sent: Sent | undefined) {
  const busy = useNavigation().state !== "idle";
  const errors: Record<string, string | undefined> = sent && sent.ok === false ? (sent.errors ?? {}) : {};
  return { v: sent?.values ?? initial, e: errors, busy };
}
