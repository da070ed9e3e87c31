// The first drawn map of a page, announced: parts that can wait (the charts, whose library is the page's largest
// script) start after it, so that they do not hold up the map. Once any map has drawn, later waiters (pages
// opened by client-side navigation) start at once.
let drawn = false;
const waiting = new Set<() => void>();

/** Called by GridMap when a raster is on the canvas. */
export function announceMapDrawn(): void {
  if (drawn) return;
  drawn = true;
  for (const start of waiting) start();
  waiting.clear();
}

/** Runs `start` once a map has drawn (now, if one has); returns a function that cancels the wait. */
export function afterMapDrawn(start: () => void): () => void {
  if (drawn) {
    start();
    return () => {};
  }
  waiting.add(start);
  return () => {
    waiting.delete(start);
  };
}
