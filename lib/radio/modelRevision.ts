// Which arithmetic of the model produced a stored result. Results of one revision are bit-identical however they
// were computed (full, incremental, threaded, split over processes); results of two revisions may differ in the
// last bits. Anything that keeps partial results between processes or runs (the cell-group partials of
// lib/jobs/queue.ts) keys them by this, so that a new revision never merges with an old one's bits.

/** Bump whenever a change alters any result bit (a formula, a rounding, the order of a sum). */
export const MODEL_REVISION = 2;
