/**
 * The placement search behind {@linkcode findHotspot}, {@linkcode findTopHotspots}
 * and {@linkcode findBestFieldSet}, for callers that keep one search across
 * several picks (the report pipeline: hotspot, then top-k separate windows).
 *
 * `createSearch(prepared, map, overlap?, budget?)` builds the state once;
 * `searchBest(state, chosen)` returns the best admissible placement separate
 * from every window in `chosen`, or null. Each call's `chosen` must extend the
 * previous call's, so the circle search can resume where it stopped.
 *
 * @module
 */

export {
  type AreaIndex,
  createSearch,
  newSearchBudget,
  searchBest,
  type SearchState,
} from "./_hotspot_search.ts";
