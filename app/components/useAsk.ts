// An inline "are you sure?" with focus that follows it: when the question opens, focus goes to its
// first answer; when it closes without acting, back to the button that asked.
import { useEffect, useRef, useState } from "react";

export function useAsk<A extends HTMLElement = HTMLButtonElement, B extends HTMLElement = HTMLButtonElement>() {
  const [asking, setAsking] = useState(false);
  const asker = useRef<A>(null);
  const answer = useRef<B>(null);
  const was = useRef(false);
  useEffect(() => {
    if (asking) answer.current?.focus();
    else if (was.current) asker.current?.focus();
    was.current = asking;
  }, [asking]);
  return { asking, setAsking, asker, answer };
}
