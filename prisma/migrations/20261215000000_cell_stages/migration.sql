-- AlterTable
ALTER TABLE "Simulation" ADD COLUMN     "progressDetail" JSONB;

-- CreateTable
CREATE TABLE "CellStage" (
    "stageKey" TEXT NOT NULL,
    "cellId" TEXT NOT NULL,
    "footprint" BYTEA,
    "pathLossDb" BYTEA NOT NULL,
    "rsrpDbm" BYTEA NOT NULL,
    "rsrpMw" BYTEA NOT NULL,
    "tileMaxDbm" BYTEA NOT NULL,
    "segmentMaxDbm" BYTEA,
    "tileOffsets" BYTEA,
    "pairs" INTEGER NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "CellStage_pkey" PRIMARY KEY ("stageKey","cellId")
);

