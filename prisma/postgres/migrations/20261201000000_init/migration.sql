-- PostgreSQL twin of prisma/migrations/20261201000000_init: the same tables, columns, indexes,
-- foreign keys and no-delete triggers, in PostgreSQL's types (Float -> DOUBLE PRECISION,
-- DateTime -> TIMESTAMP(3) holding UTC, autoincrement -> SERIAL). Never edit once applied.
-- Identifiers are at most 63 bytes in PostgreSQL (NAMEDATALEN - 1), so the one longer index name
-- of the SQLite migration is cut to its first 63 characters here.

-- CreateTable
CREATE TABLE "User" (
    "id" SERIAL NOT NULL,
    "name" TEXT NOT NULL,
    "role" TEXT NOT NULL DEFAULT 'contributor',
    "passwordHash" TEXT,
    "disabled" BOOLEAN NOT NULL DEFAULT false,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "User_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Session" (
    "id" TEXT NOT NULL,
    "userId" INTEGER NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "expiresAt" TIMESTAMP(3) NOT NULL,
    CONSTRAINT "Session_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Source" (
    "id" SERIAL NOT NULL,
    "kind" TEXT NOT NULL,
    "title" TEXT NOT NULL,
    "titleKey" TEXT NOT NULL,
    "authors" TEXT NOT NULL DEFAULT '[]',
    "year" INTEGER,
    "venue" TEXT,
    "doi" TEXT,
    "url" TEXT,
    "notes" TEXT,
    "densityMethod" TEXT NOT NULL DEFAULT 'unknown',
    "outcomeEvidence" TEXT NOT NULL DEFAULT 'statement_only',
    "machineStated" BOOLEAN NOT NULL DEFAULT false,
    "spotSizeDefinition" TEXT,
    "powderReported" BOOLEAN NOT NULL DEFAULT false,
    "atmosphereReported" BOOLEAN NOT NULL DEFAULT false,
    "qualityOverride" DOUBLE PRECISION,
    "qualityOverrideReason" TEXT,
    "qualityOverrideById" INTEGER,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdById" INTEGER,
    "updatedById" INTEGER,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMP(3) NOT NULL,
    CONSTRAINT "Source_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "StoredFile" (
    "sha256" TEXT NOT NULL,
    "sizeBytes" INTEGER NOT NULL,
    "mimeType" TEXT NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "StoredFile_pkey" PRIMARY KEY ("sha256")
);

-- CreateTable
CREATE TABLE "SourceDocument" (
    "id" SERIAL NOT NULL,
    "sourceId" INTEGER NOT NULL,
    "sha256" TEXT NOT NULL,
    "fileName" TEXT NOT NULL,
    "uploadedById" INTEGER,
    "uploadedAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "SourceDocument_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Material" (
    "id" SERIAL NOT NULL,
    "designation" TEXT NOT NULL,
    "alloyKey" TEXT NOT NULL,
    "basis" TEXT NOT NULL DEFAULT 'wt',
    "compositionKind" TEXT NOT NULL DEFAULT 'nominal',
    "fingerprint" TEXT NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "Material_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "MaterialComponent" (
    "id" SERIAL NOT NULL,
    "materialId" INTEGER NOT NULL,
    "element" TEXT NOT NULL,
    "amount" DOUBLE PRECISION NOT NULL,
    "isBalance" BOOLEAN NOT NULL DEFAULT false,
    CONSTRAINT "MaterialComponent_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "BuildRecord" (
    "id" SERIAL NOT NULL,
    "sourceId" INTEGER NOT NULL,
    "locationPage" INTEGER,
    "locationLabel" TEXT,
    "materialId" INTEGER NOT NULL,
    "alloyKey" TEXT NOT NULL,
    "machine" TEXT,
    "laserPowerW" DOUBLE PRECISION,
    "scanSpeedMmPerS" DOUBLE PRECISION,
    "hatchSpacingUm" DOUBLE PRECISION,
    "layerThicknessUm" DOUBLE PRECISION,
    "spotDiameterUm" DOUBLE PRECISION,
    "spotDefinition" TEXT,
    "preheatC" DOUBLE PRECISION,
    "atmosphere" TEXT,
    "scanStrategy" TEXT,
    "powderD10Um" DOUBLE PRECISION,
    "powderD50Um" DOUBLE PRECISION,
    "powderD90Um" DOUBLE PRECISION,
    "outcome" TEXT NOT NULL DEFAULT 'unknown',
    "outcomeText" TEXT,
    "relativeDensityPct" DOUBLE PRECISION,
    "volumetricEnergyJMm3" DOUBLE PRECISION,
    "enteredValues" TEXT NOT NULL DEFAULT '{}',
    "importRunId" INTEGER,
    "importFile" TEXT,
    "importRow" INTEGER,
    "status" TEXT NOT NULL DEFAULT 'needs_review',
    "mergedIntoId" INTEGER,
    "qualityScore" DOUBLE PRECISION,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdById" INTEGER,
    "updatedById" INTEGER,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" TIMESTAMP(3) NOT NULL,
    CONSTRAINT "BuildRecord_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ImportRun" (
    "id" SERIAL NOT NULL,
    "fileName" TEXT NOT NULL,
    "fileSha256" TEXT,
    "format" TEXT NOT NULL,
    "sheet" TEXT,
    "mapping" TEXT NOT NULL DEFAULT '{}',
    "sourceId" INTEGER,
    "rowCount" INTEGER NOT NULL DEFAULT 0,
    "importedCount" INTEGER NOT NULL DEFAULT 0,
    "excludedCount" INTEGER NOT NULL DEFAULT 0,
    "status" TEXT NOT NULL DEFAULT 'committed',
    "createdById" INTEGER,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "ImportRun_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "MappingPreset" (
    "id" SERIAL NOT NULL,
    "name" TEXT NOT NULL,
    "sourceId" INTEGER,
    "mapping" TEXT NOT NULL,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "MappingPreset_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "Flag" (
    "id" SERIAL NOT NULL,
    "recordId" INTEGER,
    "relatedRecordId" INTEGER,
    "sourceId" INTEGER,
    "ruleCode" TEXT NOT NULL,
    "severity" TEXT NOT NULL,
    "message" TEXT NOT NULL,
    "details" TEXT NOT NULL DEFAULT '{}',
    "fingerprint" TEXT NOT NULL,
    "state" TEXT NOT NULL DEFAULT 'open',
    "resolution" TEXT,
    "reason" TEXT,
    "resolvedById" INTEGER,
    "resolvedAt" TIMESTAMP(3),
    "settingsVersion" INTEGER,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "Flag_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "PairDecision" (
    "id" SERIAL NOT NULL,
    "recordAId" INTEGER NOT NULL,
    "recordBId" INTEGER NOT NULL,
    "decision" TEXT NOT NULL,
    "reason" TEXT,
    "decidedById" INTEGER,
    "decidedAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "PairDecision_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "AuditEvent" (
    "id" SERIAL NOT NULL,
    "actorId" INTEGER,
    "actorName" TEXT NOT NULL,
    "action" TEXT NOT NULL,
    "entityType" TEXT NOT NULL,
    "entityId" TEXT NOT NULL,
    "before" TEXT,
    "after" TEXT,
    "reason" TEXT,
    "at" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "AuditEvent_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "SettingsVersion" (
    "id" SERIAL NOT NULL,
    "key" TEXT NOT NULL,
    "value" TEXT NOT NULL,
    "createdById" INTEGER,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "SettingsVersion_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "AlloyPropertyOverride" (
    "id" SERIAL NOT NULL,
    "alloyKey" TEXT NOT NULL,
    "property" TEXT NOT NULL,
    "value" DOUBLE PRECISION NOT NULL,
    "source" TEXT NOT NULL,
    "createdById" INTEGER,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "AlloyPropertyOverride_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "ExportRun" (
    "id" SERIAL NOT NULL,
    "name" TEXT NOT NULL,
    "params" TEXT NOT NULL,
    "seed" INTEGER NOT NULL,
    "counts" TEXT NOT NULL DEFAULT '{}',
    "files" TEXT NOT NULL DEFAULT '{}',
    "toolVersion" TEXT NOT NULL,
    "status" TEXT NOT NULL DEFAULT 'complete',
    "createdById" INTEGER,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "ExportRun_pkey" PRIMARY KEY ("id")
);

-- CreateTable
CREATE TABLE "SuggestionSet" (
    "id" SERIAL NOT NULL,
    "alloyKey" TEXT NOT NULL,
    "seed" INTEGER NOT NULL,
    "inputs" TEXT NOT NULL,
    "suggestions" TEXT NOT NULL,
    "createdById" INTEGER,
    "createdAt" TIMESTAMP(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "SuggestionSet_pkey" PRIMARY KEY ("id")
);

-- CreateIndex
CREATE UNIQUE INDEX "User_name_key" ON "User"("name");

-- CreateIndex
CREATE INDEX "Session_userId_idx" ON "Session"("userId");

-- CreateIndex
CREATE UNIQUE INDEX "Source_doi_key" ON "Source"("doi");

-- CreateIndex
CREATE INDEX "Source_titleKey_year_idx" ON "Source"("titleKey", "year");

-- CreateIndex
CREATE UNIQUE INDEX "SourceDocument_sourceId_sha256_key" ON "SourceDocument"("sourceId", "sha256");

-- CreateIndex
CREATE UNIQUE INDEX "Material_fingerprint_key" ON "Material"("fingerprint");

-- CreateIndex
CREATE INDEX "Material_alloyKey_idx" ON "Material"("alloyKey");

-- CreateIndex
CREATE UNIQUE INDEX "MaterialComponent_materialId_element_key" ON "MaterialComponent"("materialId", "element");

-- CreateIndex
CREATE INDEX "BuildRecord_sourceId_idx" ON "BuildRecord"("sourceId");

-- CreateIndex
CREATE INDEX "BuildRecord_alloyKey_status_idx" ON "BuildRecord"("alloyKey", "status");

-- CreateIndex
CREATE INDEX "BuildRecord_status_idx" ON "BuildRecord"("status");

-- CreateIndex
CREATE INDEX "BuildRecord_outcome_idx" ON "BuildRecord"("outcome");

-- CreateIndex
CREATE INDEX "BuildRecord_laserPowerW_idx" ON "BuildRecord"("laserPowerW");

-- CreateIndex
CREATE INDEX "BuildRecord_scanSpeedMmPerS_idx" ON "BuildRecord"("scanSpeedMmPerS");

-- CreateIndex
CREATE INDEX "BuildRecord_volumetricEnergyJMm3_idx" ON "BuildRecord"("volumetricEnergyJMm3");

-- CreateIndex
CREATE INDEX "BuildRecord_alloyKey_laserPowerW_scanSpeedMmPerS_idx" ON "BuildRecord"("alloyKey", "laserPowerW", "scanSpeedMmPerS");

-- CreateIndex
CREATE INDEX "BuildRecord_importRunId_idx" ON "BuildRecord"("importRunId");

-- CreateIndex
CREATE INDEX "BuildRecord_updatedAt_idx" ON "BuildRecord"("updatedAt");

-- CreateIndex
CREATE INDEX "BuildRecord_status_alloyKey_outcome_sourceId_laserPowerW_scanSp" ON "BuildRecord"("status", "alloyKey", "outcome", "sourceId", "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm", "layerThicknessUm", "spotDiameterUm", "volumetricEnergyJMm3", "relativeDensityPct");

-- CreateIndex
CREATE UNIQUE INDEX "MappingPreset_name_sourceId_key" ON "MappingPreset"("name", "sourceId");

-- CreateIndex
CREATE UNIQUE INDEX "Flag_fingerprint_key" ON "Flag"("fingerprint");

-- CreateIndex
CREATE INDEX "Flag_recordId_state_idx" ON "Flag"("recordId", "state");

-- CreateIndex
CREATE INDEX "Flag_state_severity_idx" ON "Flag"("state", "severity");

-- CreateIndex
CREATE INDEX "Flag_ruleCode_idx" ON "Flag"("ruleCode");

-- CreateIndex
CREATE UNIQUE INDEX "PairDecision_recordAId_recordBId_key" ON "PairDecision"("recordAId", "recordBId");

-- CreateIndex
CREATE INDEX "AuditEvent_entityType_entityId_idx" ON "AuditEvent"("entityType", "entityId");

-- CreateIndex
CREATE INDEX "AuditEvent_at_idx" ON "AuditEvent"("at");

-- CreateIndex
CREATE INDEX "SettingsVersion_key_id_idx" ON "SettingsVersion"("key", "id");

-- CreateIndex
CREATE UNIQUE INDEX "AlloyPropertyOverride_alloyKey_property_key" ON "AlloyPropertyOverride"("alloyKey", "property");

-- CreateIndex
CREATE UNIQUE INDEX "ExportRun_name_key" ON "ExportRun"("name");

-- AddForeignKey
ALTER TABLE "Session" ADD CONSTRAINT "Session_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "SourceDocument" ADD CONSTRAINT "SourceDocument_sourceId_fkey" FOREIGN KEY ("sourceId") REFERENCES "Source"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "SourceDocument" ADD CONSTRAINT "SourceDocument_sha256_fkey" FOREIGN KEY ("sha256") REFERENCES "StoredFile"("sha256") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "MaterialComponent" ADD CONSTRAINT "MaterialComponent_materialId_fkey" FOREIGN KEY ("materialId") REFERENCES "Material"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "BuildRecord" ADD CONSTRAINT "BuildRecord_sourceId_fkey" FOREIGN KEY ("sourceId") REFERENCES "Source"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "BuildRecord" ADD CONSTRAINT "BuildRecord_materialId_fkey" FOREIGN KEY ("materialId") REFERENCES "Material"("id") ON DELETE RESTRICT ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "BuildRecord" ADD CONSTRAINT "BuildRecord_importRunId_fkey" FOREIGN KEY ("importRunId") REFERENCES "ImportRun"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "MappingPreset" ADD CONSTRAINT "MappingPreset_sourceId_fkey" FOREIGN KEY ("sourceId") REFERENCES "Source"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Flag" ADD CONSTRAINT "Flag_recordId_fkey" FOREIGN KEY ("recordId") REFERENCES "BuildRecord"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- AddForeignKey
ALTER TABLE "Flag" ADD CONSTRAINT "Flag_relatedRecordId_fkey" FOREIGN KEY ("relatedRecordId") REFERENCES "BuildRecord"("id") ON DELETE SET NULL ON UPDATE CASCADE;

-- Audit events are append-only; nothing a user entered is hard-deleted: records are rejected,
-- flags resolved, sources kept. One trigger function per message, as in the SQLite migration.
CREATE FUNCTION "meltledger_refuse"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    RAISE EXCEPTION '%', TG_ARGV[0] USING ERRCODE = 'restrict_violation';
END;
$$;

CREATE TRIGGER "AuditEvent_no_update" BEFORE UPDATE ON "AuditEvent" FOR EACH ROW EXECUTE FUNCTION "meltledger_refuse"('audit events are append-only');
CREATE TRIGGER "AuditEvent_no_delete" BEFORE DELETE ON "AuditEvent" FOR EACH ROW EXECUTE FUNCTION "meltledger_refuse"('audit events are append-only');
CREATE TRIGGER "BuildRecord_no_delete" BEFORE DELETE ON "BuildRecord" FOR EACH ROW EXECUTE FUNCTION "meltledger_refuse"('build records are never deleted: reject the record instead');
CREATE TRIGGER "Source_no_delete" BEFORE DELETE ON "Source" FOR EACH ROW EXECUTE FUNCTION "meltledger_refuse"('sources are never deleted');
CREATE TRIGGER "Flag_no_delete" BEFORE DELETE ON "Flag" FOR EACH ROW EXECUTE FUNCTION "meltledger_refuse"('flags are never deleted: resolve or waive them');

-- TRUNCATE skips row triggers, so it is refused by statement triggers of its own.
CREATE TRIGGER "AuditEvent_no_truncate" BEFORE TRUNCATE ON "AuditEvent" FOR EACH STATEMENT EXECUTE FUNCTION "meltledger_refuse"('audit events are append-only');
CREATE TRIGGER "BuildRecord_no_truncate" BEFORE TRUNCATE ON "BuildRecord" FOR EACH STATEMENT EXECUTE FUNCTION "meltledger_refuse"('build records are never deleted: reject the record instead');
CREATE TRIGGER "Source_no_truncate" BEFORE TRUNCATE ON "Source" FOR EACH STATEMENT EXECUTE FUNCTION "meltledger_refuse"('sources are never deleted');
CREATE TRIGGER "Flag_no_truncate" BEFORE TRUNCATE ON "Flag" FOR EACH STATEMENT EXECUTE FUNCTION "meltledger_refuse"('flags are never deleted: resolve or waive them');
