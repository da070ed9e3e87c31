-- City-scale runs keep per cell-group aggregates instead of every cell's arrays (lib/jobs/splitEvaluation.ts):
-- "CellStage" goes, "StagePartial" comes.
DROP TABLE "CellStage";

-- Not all from `prisma migrate diff`: Prisma models neither UNLOGGED nor column storage.
-- UNLOGGED: a partial is a cache, recomputed from the network when missing; writing it through the WAL would
-- double the bytes written by every cell-group job, and a server crash that empties the table only costs a rerun.
CREATE UNLOGGED TABLE "StagePartial" (
    "stageKey" TEXT NOT NULL,
    "part" INTEGER NOT NULL,
    "cells" INTEGER NOT NULL,
    "pairs" BIGINT NOT NULL,
    "gridCount" INTEGER NOT NULL,
    "slots" INTEGER NOT NULL,
    "powerHi" BYTEA NOT NULL,
    "powerLo" BYTEA NOT NULL,
    "listLength" BYTEA NOT NULL,
    "listCell" BYTEA NOT NULL,
    "listDbm" BYTEA NOT NULL,
    "parts" INTEGER[],
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "StagePartial_pkey" PRIMARY KEY ("stageKey","part")
);

-- Float and index bytes do not compress: skip TOAST's compression attempt on every write and read.
ALTER TABLE "StagePartial" ALTER COLUMN "powerHi" SET STORAGE EXTERNAL,
  ALTER COLUMN "powerLo" SET STORAGE EXTERNAL,
  ALTER COLUMN "listLength" SET STORAGE EXTERNAL,
  ALTER COLUMN "listCell" SET STORAGE EXTERNAL,
  ALTER COLUMN "listDbm" SET STORAGE EXTERNAL;
