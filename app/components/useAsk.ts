// An inline "are you sure?" with focus that follows it: when the question opens, focus goes to its
// first answer; when it closes without acting, back to the button that asked. `ready` is false
// while the answer is disabled (the page still busy with the last form): a disabled button cannot
// take focus, so it gets it as soon as it is enabled.
import { useEffect, useRef, useState } from "react";

export function useAsk<A extends HTMLElement = HTMLButtonElement, B extends HTMLElement = HTMLButtonElement>(ready = true) {
  const [asking, setAsking] = useState(false);
  const asker = useRef<A>(null);
  const answer = useRef<B>(null);
  const was = useRef(false);
  const given = useRef(false);
  useEffect(() => {
    if (asking && ready && !given.current) {
      answer.current?.focus();
      given.current = document.activeElement === answer.current;
    } else if (!asking) {
      if (was.current) asker.current?.focus();
      given.current = false;
    }
    was.current = asking;
  }, [asking, ready]);
  return { asking, setAsking, asker, answer };
}
