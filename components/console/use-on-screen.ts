"use client";

import { useEffect, useState } from "react";

/**
 * Whether the element is (near) the visible part of the page. Views that cost
 * work on every update (charts, the inspector) pause while scrolled away,
 * since nobody sees them redraw; they catch up as soon as they come back.
 */
export function useOnScreen(ref: React.RefObject<Element | null>): boolean {
  const [onScreen, setOnScreen] = useState(true);
  useEffect(() => {
    const element = ref.current;
    if (element === null || typeof IntersectionObserver === "undefined") return;
    const observer = new IntersectionObserver(
      (entries) => setOnScreen(entries.some((entry) => entry.isIntersecting)),
      { rootMargin: "200px" },
    );
    observer.observe(element);
    return () => observer.disconnect();
  }, [ref]);
  return onScreen;
}
