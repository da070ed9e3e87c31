-- CreateSchema
CREATE SCHEMA IF NOT EXISTS "public";

-- CreateTable
CREATE TABLE "User" (
    "id" TEXT NOT NULL,
    "email" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "role" TEXT NOT NULL,
    "passwordHash" TEXT NOT NULL,
    "active" BOOLEAN NOT NULL DEFAULT true,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMP(3) NOT NULL,

    CONSTRAINT "User_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Network" (
    "id" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "originLon" DOUBLE PRECISION,
    "originLat" DOUBLE PRECISION,
    "minX" DOUBLE PRECISION NOT NULL,
    "minY" DOUBLE PRECISION NOT NULL,
    "maxX" DOUBLE PRECISION NOT NULL,
    "maxY" DOUBLE PRECISION NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Network_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "KpiSettings" (
    "networkId" TEXT NOT NULL,
    "gridSizeM" DOUBLE PRECISION NOT NULL,
    "userHeightM" DOUBLE PRECISION NOT NULL,
    "floorHeightM" DOUBLE PRECISION NOT NULL,
    "environment" TEXT NOT NULL,
    "buildingLoss" TEXT NOT NULL,
    "diffraction" BOOLEAN NOT NULL,
    "otherLossesDb" DOUBLE PRECISION NOT NULL,
    "noiseFigureDb" DOUBLE PRECISION NOT NULL,
    "coverageThresholdDbm" DOUBLE PRECISION NOT NULL,
    "overlapDeltaDb" DOUBLE PRECISION NOT NULL,
    "overlapMaxOthers" INTEGER NOT NULL,
    "overlapFloorDbm" DOUBLE PRECISION NOT NULL,
    "interferenceThresholdDb" DOUBLE PRECISION NOT NULL,
    "worstGridDropDb" DOUBLE PRECISION NOT NULL,
    "updatedAt" TIMESTAMP(3) NOT NULL,

    CONSTRAINT "KpiSettings_pkey" PRIMARY KEY ("networkId")
);

-- CreateTable
CREATE TABLE "NetworkVersion" (
    "id" TEXT NOT NULL,
    "networkId" TEXT NOT NULL,
    "number" INTEGER NOT NULL,
    "kind" TEXT NOT NULL,
    "note" TEXT NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "createdById" TEXT,
    "changeRequestId" TEXT,

    CONSTRAINT "NetworkVersion_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "AntennaModel" (
    "id" TEXT NOT NULL,
    "networkId" TEXT NOT NULL,
    "code" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "elementHBeamwidthDeg" DOUBLE PRECISION NOT NULL,
    "elementVBeamwidthDeg" DOUBLE PRECISION NOT NULL,
    "elementGainDbi" DOUBLE PRECISION NOT NULL,
    "frontToBackDb" DOUBLE PRECISION NOT NULL,
    "sideLobeLevelDb" DOUBLE PRECISION NOT NULL,
    "rows" INTEGER NOT NULL,
    "columns" INTEGER NOT NULL,
    "verticalSpacingWl" DOUBLE PRECISION NOT NULL,
    "horizontalSpacingWl" DOUBLE PRECISION NOT NULL,
    "electricalTiltMinDeg" DOUBLE PRECISION NOT NULL,
    "electricalTiltMaxDeg" DOUBLE PRECISION NOT NULL,
    "mechanicalTiltMinDeg" DOUBLE PRECISION NOT NULL,
    "mechanicalTiltMaxDeg" DOUBLE PRECISION NOT NULL,
    "rsPowerMinDbm" DOUBLE PRECISION NOT NULL,
    "rsPowerMaxDbm" DOUBLE PRECISION NOT NULL,
    "beamSetCodes" TEXT[],

    CONSTRAINT "AntennaModel_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "BeamSet" (
    "id" TEXT NOT NULL,
    "networkId" TEXT NOT NULL,
    "code" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "description" TEXT NOT NULL,
    "beams" JSONB NOT NULL,

    CONSTRAINT "BeamSet_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Site" (
    "id" TEXT NOT NULL,
    "networkId" TEXT NOT NULL,
    "code" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "x" DOUBLE PRECISION NOT NULL,
    "y" DOUBLE PRECISION NOT NULL,
    "groundHeightM" DOUBLE PRECISION NOT NULL,

    CONSTRAINT "Site_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Cell" (
    "id" TEXT NOT NULL,
    "networkId" TEXT NOT NULL,
    "siteId" TEXT NOT NULL,
    "code" TEXT NOT NULL,
    "antennaModelId" TEXT NOT NULL,
    "antennaHeightM" DOUBLE PRECISION NOT NULL,
    "frequencyMHz" DOUBLE PRECISION NOT NULL,
    "bandwidthMHz" DOUBLE PRECISION NOT NULL,
    "subcarrierSpacingKHz" DOUBLE PRECISION NOT NULL,
    "azimuthDeg" DOUBLE PRECISION NOT NULL,
    "mechanicalTiltDeg" DOUBLE PRECISION NOT NULL,
    "electricalTiltDeg" DOUBLE PRECISION NOT NULL,
    "beamSetCode" TEXT NOT NULL,
    "rsPowerDbm" DOUBLE PRECISION NOT NULL,

    CONSTRAINT "Cell_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "CellParameterValue" (
    "id" TEXT NOT NULL,
    "cellId" TEXT NOT NULL,
    "parameter" TEXT NOT NULL,
    "value" TEXT NOT NULL,
    "validFrom" TIMESTAMP(3) NOT NULL,
    "validTo" TIMESTAMP(3),
    "fromVersion" INTEGER NOT NULL,
    "toVersion" INTEGER,
    "changeRequestId" TEXT,

    CONSTRAINT "CellParameterValue_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Building" (
    "id" TEXT NOT NULL,
    "networkId" TEXT NOT NULL,
    "code" TEXT NOT NULL,
    "footprint" JSONB NOT NULL,
    "heightM" DOUBLE PRECISION NOT NULL,
    "floors" INTEGER NOT NULL,

    CONSTRAINT "Building_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Cluster" (
    "id" TEXT NOT NULL,
    "networkId" TEXT NOT NULL,
    "code" TEXT NOT NULL,
    "name" TEXT NOT NULL,
    "polygon" JSONB NOT NULL,

    CONSTRAINT "Cluster_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Raster" (
    "id" TEXT NOT NULL,
    "networkId" TEXT NOT NULL,
    "kind" TEXT NOT NULL,
    "originX" DOUBLE PRECISION NOT NULL,
    "originY" DOUBLE PRECISION NOT NULL,
    "cellSize" DOUBLE PRECISION NOT NULL,
    "width" INTEGER NOT NULL,
    "height" INTEGER NOT NULL,
    "values" BYTEA NOT NULL,

    CONSTRAINT "Raster_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ChangeRequest" (
    "id" TEXT NOT NULL,
    "number" SERIAL NOT NULL,
    "networkId" TEXT NOT NULL,
    "title" TEXT NOT NULL,
    "reason" TEXT NOT NULL,
    "state" TEXT NOT NULL,
    "authorId" TEXT NOT NULL,
    "approverId" TEXT,
    "baseVersion" INTEGER NOT NULL,
    "revision" INTEGER NOT NULL DEFAULT 1,
    "version" INTEGER NOT NULL DEFAULT 1,
    "stale" BOOLEAN NOT NULL DEFAULT false,
    "staleReason" TEXT,
    "windowStart" TIMESTAMP(3),
    "windowEnd" TIMESTAMP(3),
    "decidedAt" TIMESTAMP(3),
    "implementedVersion" INTEGER,
    "rolledBackVersion" INTEGER,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMP(3) NOT NULL,

    CONSTRAINT "ChangeRequest_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ChangeItem" (
    "id" TEXT NOT NULL,
    "requestId" TEXT NOT NULL,
    "position" INTEGER NOT NULL,
    "cellCode" TEXT NOT NULL,
    "parameter" TEXT NOT NULL,
    "oldValue" TEXT NOT NULL,
    "newValue" TEXT NOT NULL,

    CONSTRAINT "ChangeItem_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Comment" (
    "id" TEXT NOT NULL,
    "requestId" TEXT NOT NULL,
    "authorId" TEXT NOT NULL,
    "text" TEXT NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,

    CONSTRAINT "Comment_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Simulation" (
    "id" TEXT NOT NULL,
    "requestId" TEXT NOT NULL,
    "revision" INTEGER NOT NULL,
    "purpose" TEXT NOT NULL,
    "status" TEXT NOT NULL,
    "changes" JSONB,
    "progress" DOUBLE PRECISION NOT NULL DEFAULT 0,
    "attempts" INTEGER NOT NULL DEFAULT 0,
    "error" TEXT,
    "summary" JSONB,
    "worstGrids" JSONB,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "startedAt" TIMESTAMP(3),
    "finishedAt" TIMESTAMP(3),

    CONSTRAINT "Simulation_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "SimulationRaster" (
    "id" TEXT NOT NULL,
    "simulationId" TEXT NOT NULL,
    "layer" TEXT NOT NULL,
    "encoding" TEXT NOT NULL,
    "length" INTEGER NOT NULL,
    "data" BYTEA NOT NULL,

    CONSTRAINT "SimulationRaster_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "AuditEvent" (
    "seq" INTEGER NOT NULL,
    "at" TIMESTAMP(3) NOT NULL,
    "actorId" TEXT,
    "actorEmail" TEXT,
    "action" TEXT NOT NULL,
    "entityType" TEXT NOT NULL,
    "entityId" TEXT NOT NULL,
    "requestId" TEXT,
    "before" JSONB,
    "after" JSONB,
    "prevHash" TEXT NOT NULL,
    "hash" TEXT NOT NULL,

    CONSTRAINT "AuditEvent_pkey" PRIMARY KEY ("seq")
);

-- CreateTable
CREATE TABLE "AuditHead" (
    "id" INTEGER NOT NULL,
    "seq" INTEGER NOT NULL,
    "hash" TEXT NOT NULL,

    CONSTRAINT "AuditHead_pkey" PRIMARY KEY ("id")
);

-- CreateIndex
CREATE UNIQUE INDEX "User_email_key" ON "User"("email");

-- CreateIndex
CREATE UNIQUE INDEX "Network_name_key" ON "Network"("name");

-- CreateIndex
CREATE UNIQUE INDEX "NetworkVersion_networkId_number_key" ON "NetworkVersion"("networkId", "number");

-- CreateIndex
CREATE UNIQUE INDEX "AntennaModel_networkId_code_key" ON "AntennaModel"("networkId", "code");

-- CreateIndex
CREATE UNIQUE INDEX "BeamSet_networkId_code_key" ON "BeamSet"("networkId", "code");

-- CreateIndex
CREATE UNIQUE INDEX "Site_networkId_code_key" ON "Site"("networkId", "code");

-- CreateIndex
CREATE INDEX "Cell_siteId_idx" ON "Cell"("siteId");

-- CreateIndex
CREATE UNIQUE INDEX "Cell_networkId_code_key" ON "Cell"("networkId", "code");

-- CreateIndex
CREATE INDEX "CellParameterValue_cellId_parameter_validFrom_idx" ON "CellParameterValue"("cellId", "parameter", "validFrom");

-- CreateIndex
CREATE UNIQUE INDEX "Building_networkId_code_key" ON "Building"("networkId", "code");

-- CreateIndex
CREATE UNIQUE INDEX "Cluster_networkId_code_key" ON "Cluster"("networkId", "code");

-- CreateIndex
CREATE UNIQUE INDEX "Raster_networkId_kind_key" ON "Raster"("networkId", "kind");

-- CreateIndex
CREATE UNIQUE INDEX "ChangeRequest_number_key" ON "ChangeRequest"("number");

-- CreateIndex
CREATE INDEX "ChangeRequest_networkId_state_idx" ON "ChangeRequest"("networkId", "state");

-- CreateIndex
CREATE UNIQUE INDEX "ChangeItem_requestId_cellCode_parameter_key" ON "ChangeItem"("requestId", "cellCode", "parameter");

-- CreateIndex
CREATE INDEX "Simulation_requestId_revision_idx" ON "Simulation"("requestId", "revision");

-- CreateIndex
CREATE UNIQUE INDEX "SimulationRaster_simulationId_layer_key" ON "SimulationRaster"("simulationId", "layer");

-- CreateIndex
CREATE UNIQUE INDEX "AuditEvent_hash_key" ON "AuditEvent"("hash");

-- CreateIndex
CREATE INDEX "AuditEvent_requestId_idx" ON "AuditEvent"("requestId");

-- CreateIndex
CREATE INDEX "AuditEvent_entityType_entityId_idx" ON "AuditEvent"("entityType", "entityId");

-- AddForeignKey
ALTER TABLE "KpiSettings" ADD CONSTRAINT "KpiSettings_networkId_fkey" FOREIGN KEY ("networkId") REFERENCES "Network"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "NetworkVersion" ADD CONSTRAINT "NetworkVersion_networkId_fkey" FOREIGN KEY ("networkId") REFERENCES "Network"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "NetworkVersion" ADD CONSTRAINT "NetworkVersion_createdById_fkey" FOREIGN KEY ("createdById") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "AntennaModel" ADD CONSTRAINT "AntennaModel_networkId_fkey" FOREIGN KEY ("networkId") REFERENCES "Network"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "BeamSet" ADD CONSTRAINT "BeamSet_networkId_fkey" FOREIGN KEY ("networkId") REFERENCES "Network"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Site" ADD CONSTRAINT "Site_networkId_fkey" FOREIGN KEY ("networkId") REFERENCES "Network"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Cell" ADD CONSTRAINT "Cell_networkId_fkey" FOREIGN KEY ("networkId") REFERENCES "Network"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Cell" ADD CONSTRAINT "Cell_siteId_fkey" FOREIGN KEY ("siteId") REFERENCES "Site"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Cell" ADD CONSTRAINT "Cell_antennaModelId_fkey" FOREIGN KEY ("antennaModelId") REFERENCES "AntennaModel"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "CellParameterValue" ADD CONSTRAINT "CellParameterValue_cellId_fkey" FOREIGN KEY ("cellId") REFERENCES "Cell"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Building" ADD CONSTRAINT "Building_networkId_fkey" FOREIGN KEY ("networkId") REFERENCES "Network"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Cluster" ADD CONSTRAINT "Cluster_networkId_fkey" FOREIGN KEY ("networkId") REFERENCES "Network"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Raster" ADD CONSTRAINT "Raster_networkId_fkey" FOREIGN KEY ("networkId") REFERENCES "Network"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ChangeRequest" ADD CONSTRAINT "ChangeRequest_networkId_fkey" FOREIGN KEY ("networkId") REFERENCES "Network"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ChangeRequest" ADD CONSTRAINT "ChangeRequest_authorId_fkey" FOREIGN KEY ("authorId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ChangeRequest" ADD CONSTRAINT "ChangeRequest_approverId_fkey" FOREIGN KEY ("approverId") REFERENCES "User"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "ChangeItem" ADD CONSTRAINT "ChangeItem_requestId_fkey" FOREIGN KEY ("requestId") REFERENCES "ChangeRequest"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Comment" ADD CONSTRAINT "Comment_requestId_fkey" FOREIGN KEY ("requestId") REFERENCES "ChangeRequest"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Comment" ADD CONSTRAINT "Comment_authorId_fkey" FOREIGN KEY ("authorId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Simulation" ADD CONSTRAINT "Simulation_requestId_fkey" FOREIGN KEY ("requestId") REFERENCES "ChangeRequest"("id") ON DELETE CASCADE ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "SimulationRaster" ADD CONSTRAINT "SimulationRaster_simulationId_fkey" FOREIGN KEY ("simulationId") REFERENCES "Simulation"("id") ON DELETE CASCADE ON UPDATE CASCADE;

