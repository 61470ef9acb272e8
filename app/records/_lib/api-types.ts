/** The JSON the records API sends, as the browser receives it (dates are ISO strings). */
export interface RecordsApiRow {
  id: number;
  sourceId: number;
  sourceLabel: string;
  alloyKey: string;
  laserPowerW: number | null;
  scanSpeedMmPerS: number | null;
  hatchSpacingUm: number | null;
  layerThicknessUm: number | null;
  spotDiameterUm: number | null;
  volumetricEnergyJMm3: number | null;
  relativeDensityPct: number | null;
  outcome: string;
  status: string;
  qualityScore: number | null;
  machine: string | null;
  locationPage: number | null;
  locationLabel: string | null;
  updatedAt: string;
}

export interface RecordsApiPage {
  rows: RecordsApiRow[];
  total: number;
  page: number;
  pageSize: number;
}

export interface ApiErrorBody {
  error: { code: string; message: string; details?: Record<string, unknown> };
}

export interface RecordFacets {
  alloys: string[];
  sources: { id: number; label: string }[];
}
