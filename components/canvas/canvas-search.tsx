"use client";

import { useId, useMemo, useState } from "react";
import type { Bench } from "@/engine";
import type { NodeRef } from "@/components/bench-editor/model/move-nodes";

interface SearchHit {
  readonly key: string;
  readonly node: NodeRef;
  readonly primary: string;
  readonly secondary: string;
}

const MAX_HITS = 12;

/** Finds group addresses and devices by address, name or id; "/" or Ctrl+F on the canvas focuses it. */
export function searchBench(bench: Bench, query: string): SearchHit[] {
  const q = query.trim().toLowerCase();
  if (q === "") return [];
  const hits: SearchHit[] = [];
  for (const g of bench.groupAddresses) {
    if (g.address.startsWith(q) || g.name.toLowerCase().includes(q)) {
      hits.push({
        key: `g:${g.address}`,
        node: { kind: "group-address", address: g.address },
        primary: g.address,
        secondary: g.name,
      });
      if (hits.length >= MAX_HITS) return hits;
    }
  }
  for (const d of bench.devices) {
    if (
      d.name.toLowerCase().includes(q) ||
      d.id.includes(q) ||
      (d.individualAddress ?? "").startsWith(q)
    ) {
      hits.push({
        key: `d:${d.id}`,
        node: { kind: "device", id: d.id },
        primary: d.individualAddress ?? "unit link",
        secondary: d.name,
      });
      if (hits.length >= MAX_HITS) return hits;
    }
  }
  return hits;
}

/**
 * A combobox (WAI-ARIA APG "combobox with listbox popup"): typing lists hits,
 * the arrow keys move the active option, Enter reveals it on the canvas.
 */
export function CanvasSearch({
  bench,
  inputRef,
  onReveal,
}: {
  bench: Bench;
  inputRef: React.RefObject<HTMLInputElement | null>;
  onReveal: (node: NodeRef) => void;
}) {
  const [query, setQuery] = useState("");
  const [active, setActive] = useState(0);
  const hits = useMemo(() => searchBench(bench, query), [bench, query]);
  const listId = useId();
  const open = hits.length > 0;
  const current = open ? Math.min(active, hits.length - 1) : -1;
  const choose = (hit: SearchHit) => {
    onReveal(hit.node);
    setQuery("");
    setActive(0);
    inputRef.current?.blur();
  };
  return (
    <div className="absolute top-3 left-3 z-10 w-72">
      <input
        ref={inputRef}
        type="search"
        role="combobox"
        aria-expanded={open}
        aria-controls={listId}
        aria-autocomplete="list"
        aria-activedescendant={current >= 0 ? `${listId}-${current}` : undefined}
        value={query}
        onChange={(e) => {
          setQuery(e.target.value);
          setActive(0);
        }}
        onKeyDown={(e) => {
          if (e.key === "ArrowDown" && open) {
            e.preventDefault();
            setActive((current + 1) % hits.length);
          } else if (e.key === "ArrowUp" && open) {
            e.preventDefault();
            setActive((current - 1 + hits.length) % hits.length);
          } else if (e.key === "Enter" && hits[current]) {
            choose(hits[current]);
          } else if (e.key === "Escape") {
            setQuery("");
            e.currentTarget.blur();
          }
        }}
        placeholder="Find address or device  ( / )"
        aria-label="Search the canvas for an address or device"
        className="w-full rounded-md border border-graphite-line bg-graphite-raised px-3 py-1.5 text-sm text-graphite-text placeholder:text-graphite-muted"
      />
      <ul
        id={listId}
        role="listbox"
        aria-label="Search results"
        hidden={!open}
        className="mt-1 overflow-hidden rounded-md border border-graphite-line bg-graphite-raised text-sm text-graphite-text shadow-lg"
      >
        {hits.map((hit, index) => (
          <li
            key={hit.key}
            id={`${listId}-${index}`}
            role="option"
            aria-selected={index === current}
            // Keeps focus in the input, so the list stays open until the click lands.
            onMouseDown={(e) => e.preventDefault()}
            onClick={() => choose(hit)}
            className={`flex min-h-8 w-full cursor-pointer items-center gap-3 px-3 py-1.5 hover:bg-graphite-line ${
              index === current ? "bg-graphite-line" : ""
            }`}
          >
            <span className="w-20 shrink-0 font-mono text-copper-bright">{hit.primary}</span>
            <span className="truncate">{hit.secondary}</span>
          </li>
        ))}
      </ul>
    </div>
  );
}
