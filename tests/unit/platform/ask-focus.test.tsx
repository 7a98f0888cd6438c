// @vitest-environment jsdom
// The inline "are you sure?" (app/components/useAsk.ts): focus goes to the first answer when the
// question opens, also when that answer was still disabled at that moment (the page busy with the
// last form), and back to the button that asked when it closes. WCAG 2.2 SC 2.4.3 Focus Order.
import { cleanup, fireEvent, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { useAsk } from "../../../app/components/useAsk";

function Question({ busy }: { busy: boolean }) {
  const ask = useAsk(!busy);
  return ask.asking ? (
    <p>
      <button ref={ask.answer} disabled={busy}>
        Turn off access
      </button>
      <button onClick={() => ask.setAsking(false)}>Keep access</button>
    </p>
  ) : (
    <button ref={ask.asker} onClick={() => ask.setAsking(true)}>
      Turn off access…
    </button>
  );
}

afterEach(cleanup);

describe("focus follows the question", () => {
  it("goes to the answer when it opens, and back to the asking button when it closes", () => {
    render(<Question busy={false} />);
    fireEvent.click(screen.getByRole("button", { name: "Turn off access…" }));
    expect(document.activeElement).toBe(screen.getByRole("button", { name: "Turn off access" }));
    fireEvent.click(screen.getByRole("button", { name: "Keep access" }));
    expect(document.activeElement).toBe(screen.getByRole("button", { name: "Turn off access…" }));
  });

  it("opened while the page is busy, the answer gets focus once it is enabled", () => {
    const { rerender } = render(<Question busy={true} />);
    fireEvent.click(screen.getByRole("button", { name: "Turn off access…" }));
    const answer = screen.getByRole("button", { name: "Turn off access" });
    expect(document.activeElement).not.toBe(answer);
    rerender(<Question busy={false} />);
    expect(document.activeElement).toBe(answer);
  });
});
