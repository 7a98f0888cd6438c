// What an error boundary says about an error, in the user's words: the root's and the runner's and
// the editor's boundaries read the same answer. `again` says whether trying again can help.
import { isRouteErrorResponse } from "react-router";

export type ErrorWords = { title: string; detail: string; again: boolean; status: number | null };

export function errorWords(error: unknown): ErrorWords {
  if (!isRouteErrorResponse(error)) {
    return {
      title: "Something went wrong",
      detail: "Cluepath hit an unexpected error. Your earlier entries are saved; go back and try again.",
      again: true,
      status: null,
    };
  }
  const message = typeof error.data === "object" && error.data && "error" in error.data ? String(error.data.error) : undefined;
  if (error.status === 404)
    return {
      title: "Not found",
      detail: message ?? "There is nothing at this address, or it belongs to another shop.",
      again: false,
      status: 404,
    };
  if (error.status === 403)
    return { title: "Not for your role", detail: message ?? "Your role cannot open this page.", again: false, status: 403 };
  if (error.status === 503) {
    // The server's database-outage answer (errors.server.ts) carries the words to show.
    return {
      title: "Can't reach the database",
      detail: message ?? "Cluepath can't reach its database; what you typed is kept — try again in a minute.",
      again: true,
      status: 503,
    };
  }
  return { title: `Error ${error.status}`, detail: message ?? error.statusText, again: error.status >= 500, status: error.status };
}
