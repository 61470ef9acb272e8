-- CreateTable
CREATE TABLE "User" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "name" TEXT NOT NULL,
    "role" TEXT NOT NULL DEFAULT 'contributor',
    "passwordHash" TEXT,
    "disabled" BOOLEAN NOT NULL DEFAULT false,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "Session" (
    "id" TEXT NOT NULL PRIMARY KEY,
    "userId" INTEGER NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "expiresAt" DATETIME NOT NULL,
    CONSTRAINT "Session_userId_fkey" FOREIGN KEY ("userId") REFERENCES "User" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Source" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
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
    "qualityOverride" REAL,
    "qualityOverrideReason" TEXT,
    "qualityOverrideById" INTEGER,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdById" INTEGER,
    "updatedById" INTEGER,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" DATETIME NOT NULL
);

-- CreateTable
CREATE TABLE "StoredFile" (
    "sha256" TEXT NOT NULL PRIMARY KEY,
    "sizeBytes" INTEGER NOT NULL,
    "mimeType" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "SourceDocument" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "sourceId" INTEGER NOT NULL,
    "sha256" TEXT NOT NULL,
    "fileName" TEXT NOT NULL,
    "uploadedById" INTEGER,
    "uploadedAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "SourceDocument_sourceId_fkey" FOREIGN KEY ("sourceId") REFERENCES "Source" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "SourceDocument_sha256_fkey" FOREIGN KEY ("sha256") REFERENCES "StoredFile" ("sha256") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Material" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "designation" TEXT NOT NULL,
    "alloyKey" TEXT NOT NULL,
    "basis" TEXT NOT NULL DEFAULT 'wt',
    "compositionKind" TEXT NOT NULL DEFAULT 'nominal',
    "fingerprint" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "MaterialComponent" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "materialId" INTEGER NOT NULL,
    "element" TEXT NOT NULL,
    "amount" REAL NOT NULL,
    "isBalance" BOOLEAN NOT NULL DEFAULT false,
    CONSTRAINT "MaterialComponent_materialId_fkey" FOREIGN KEY ("materialId") REFERENCES "Material" ("id") ON DELETE RESTRICT ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "BuildRecord" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "sourceId" INTEGER NOT NULL,
    "locationPage" INTEGER,
    "locationLabel" TEXT,
    "materialId" INTEGER NOT NULL,
    "alloyKey" TEXT NOT NULL,
    "machine" TEXT,
    "laserPowerW" REAL,
    "scanSpeedMmPerS" REAL,
    "hatchSpacingUm" REAL,
    "layerThicknessUm" REAL,
    "spotDiameterUm" REAL,
    "spotDefinition" TEXT,
    "preheatC" REAL,
    "atmosphere" TEXT,
    "scanStrategy" TEXT,
    "powderD10Um" REAL,
    "powderD50Um" REAL,
    "powderD90Um" REAL,
    "outcome" TEXT NOT NULL DEFAULT 'unknown',
    "outcomeText" TEXT,
    "relativeDensityPct" REAL,
    "volumetricEnergyJMm3" REAL,
    "enteredValues" TEXT NOT NULL DEFAULT '{}',
    "importRunId" INTEGER,
    "importFile" TEXT,
    "importRow" INTEGER,
    "status" TEXT NOT NULL DEFAULT 'needs_review',
    "mergedIntoId" INTEGER,
    "qualityScore" REAL,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdById" INTEGER,
    "updatedById" INTEGER,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "updatedAt" DATETIME NOT NULL,
    CONSTRAINT "BuildRecord_sourceId_fkey" FOREIGN KEY ("sourceId") REFERENCES "Source" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "BuildRecord_materialId_fkey" FOREIGN KEY ("materialId") REFERENCES "Material" ("id") ON DELETE RESTRICT ON UPDATE CASCADE,
    CONSTRAINT "BuildRecord_importRunId_fkey" FOREIGN KEY ("importRunId") REFERENCES "ImportRun" ("id") ON DELETE SET NULL ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "ImportRun" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
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
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "MappingPreset" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "name" TEXT NOT NULL,
    "sourceId" INTEGER,
    "mapping" TEXT NOT NULL,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "MappingPreset_sourceId_fkey" FOREIGN KEY ("sourceId") REFERENCES "Source" ("id") ON DELETE SET NULL ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "Flag" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
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
    "resolvedAt" DATETIME,
    "settingsVersion" INTEGER,
    "version" INTEGER NOT NULL DEFAULT 1,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP,
    CONSTRAINT "Flag_recordId_fkey" FOREIGN KEY ("recordId") REFERENCES "BuildRecord" ("id") ON DELETE SET NULL ON UPDATE CASCADE,
    CONSTRAINT "Flag_relatedRecordId_fkey" FOREIGN KEY ("relatedRecordId") REFERENCES "BuildRecord" ("id") ON DELETE SET NULL ON UPDATE CASCADE
);

-- CreateTable
CREATE TABLE "PairDecision" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "recordAId" INTEGER NOT NULL,
    "recordBId" INTEGER NOT NULL,
    "decision" TEXT NOT NULL,
    "reason" TEXT,
    "decidedById" INTEGER,
    "decidedAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "AuditEvent" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "actorId" INTEGER,
    "actorName" TEXT NOT NULL,
    "action" TEXT NOT NULL,
    "entityType" TEXT NOT NULL,
    "entityId" TEXT NOT NULL,
    "before" TEXT,
    "after" TEXT,
    "reason" TEXT,
    "at" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "SettingsVersion" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "key" TEXT NOT NULL,
    "value" TEXT NOT NULL,
    "createdById" INTEGER,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "AlloyPropertyOverride" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "alloyKey" TEXT NOT NULL,
    "property" TEXT NOT NULL,
    "value" REAL NOT NULL,
    "source" TEXT NOT NULL,
    "createdById" INTEGER,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "ExportRun" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "name" TEXT NOT NULL,
    "params" TEXT NOT NULL,
    "seed" INTEGER NOT NULL,
    "counts" TEXT NOT NULL DEFAULT '{}',
    "files" TEXT NOT NULL DEFAULT '{}',
    "toolVersion" TEXT NOT NULL,
    "status" TEXT NOT NULL DEFAULT 'complete',
    "createdById" INTEGER,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
);

-- CreateTable
CREATE TABLE "SuggestionSet" (
    "id" INTEGER NOT NULL PRIMARY KEY AUTOINCREMENT,
    "alloyKey" TEXT NOT NULL,
    "seed" INTEGER NOT NULL,
    "inputs" TEXT NOT NULL,
    "suggestions" TEXT NOT NULL,
    "createdById" INTEGER,
    "createdAt" DATETIME NOT NULL DEFAULT CURRENT_TIMESTAMP
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
CREATE INDEX "BuildRecord_status_alloyKey_outcome_sourceId_laserPowerW_scanSpeedMmPerS_hatchSpacingUm_layerThicknessUm_spotDiameterUm_volumetricEnergyJMm3_relativeDensityPct_idx" ON "BuildRecord"("status", "alloyKey", "outcome", "sourceId", "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm", "layerThicknessUm", "spotDiameterUm", "volumetricEnergyJMm3", "relativeDensityPct");

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

-- Audit events are append-only.
CREATE TRIGGER "AuditEvent_no_update" BEFORE UPDATE ON "AuditEvent" BEGIN SELECT RAISE(ABORT, 'audit events are append-only'); END;
CREATE TRIGGER "AuditEvent_no_delete" BEFORE DELETE ON "AuditEvent" BEGIN SELECT RAISE(ABORT, 'audit events are append-only'); END;

-- Nothing a user entered is hard-deleted: records are rejected, flags resolved, sources kept.
CREATE TRIGGER "BuildRecord_no_delete" BEFORE DELETE ON "BuildRecord" BEGIN SELECT RAISE(ABORT, 'build records are never deleted: reject the record instead'); END;
CREATE TRIGGER "Source_no_delete" BEFORE DELETE ON "Source" BEGIN SELECT RAISE(ABORT, 'sources are never deleted'); END;
CREATE TRIGGER "Flag_no_delete" BEFORE DELETE ON "Flag" BEGIN SELECT RAISE(ABORT, 'flags are never deleted: resolve or waive them'); END;
