import { NextResponse } from "next/server";
import { handle, readJson } from "../_lib/respond";
import { networkIdFrom } from "../network/_lib";
import { requireActor } from "@/lib/auth/session";
import { runtime } from "@/app/_lib/runtime";
import { listRequests } from "@/lib/db/requests/data";
import { createRequest } from "@/lib/db/requests/mutations";
import { REQUEST_STATES, type RequestState } from "@/lib/changes/rules";
import { DomainError } from "@/lib/changes/errors";

export const dynamic = "force-dynamic";

/** GET /api/requests?state=simulated&state=submitted&author=<user id>&stale=true */
export const GET = handle(async (request: Request) => {
  await requireActor("request.read");
  const { db } = await runtime();
  const params = new URL(request.url).searchParams;
  const states = params.getAll("state");
  for (const state of states) {
    if (!(REQUEST_STATES as readonly string[]).includes(state)) {
      throw new DomainError("invalid", `state: unknown state "${state}"`, { field: "state" });
    }
  }
  const stale = params.get("stale");
  const rows = await listRequests(db.prisma, {
    ...(states.length ? { states: states as RequestState[] } : {}),
    ...(params.get("author") ? { authorId: params.get("author")! } : {}),
    ...(stale === "true" || stale === "false" ? { stale: stale === "true" } : {}),
  });
  return NextResponse.json({ requests: rows });
});

/**
 * POST /api/requests[?network=<id>] {title, reason, items: [{cellId, parameter, newValue}], windowStart?, windowEnd?}
 * On the network named, else the first one (as every page shows).
 */
export const POST = handle(async (request: Request) => {
  const actor = await requireActor("request.create");
  const { db } = await runtime();
  const networkId = await networkIdFrom(db.prisma, new URL(request.url).searchParams);
  const result = await createRequest(db, actor, await readJson(request), networkId);
  return NextResponse.json(result, { status: 201 });
});
