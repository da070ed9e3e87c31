// Next.js calls register() once when a server starts, before it serves requests.
export async function register(): Promise<void> {
  // Node.js only: the database and the coverage model do not run in the edge runtime.
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { prepareOpeningMapsAtStart } = await import("./app/_lib/mapRasters");
  prepareOpeningMapsAtStart();
}
