"use client";

import { useEffect, useRef } from "react";

/** Wraps a value that briefly glows teal each time `version` moves on, so a change catches the eye. */
export function Flash({
  version,
  children,
  className,
}: {
  version: number;
  children: React.ReactNode;
  className?: string;
}) {
  const ref = useRef<HTMLSpanElement>(null);
  useEffect(() => {
    if (version === 0) return;
    ref.current?.animate?.(
      [{ backgroundColor: "rgb(30 131 119 / 0.35)" }, { backgroundColor: "rgb(30 131 119 / 0)" }],
      { duration: 1200, easing: "ease-out" },
    );
  }, [version]);
  return (
    <span ref={ref} data-version={version} className={className}>
      {children}
    </span>
  );
}
