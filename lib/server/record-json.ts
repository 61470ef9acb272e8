import type { RecordTableRow } from "../db/records";

/** The record as pipelines see it: canonical snake_case keys with units in their names. */
export function toRecordJson(r: RecordTableRow) {
  return {
    id: r.id,
    source_id: r.sourceId,
    alloy: r.alloyKey,
    laser_power_w: r.laserPowerW,
    scan_speed_mm_s: r.scanSpeedMmPerS,
    hatch_spacing_um: r.hatchSpacingUm,
    layer_thickness_um: r.layerThicknessUm,
    spot_diameter_um: r.spotDiameterUm,
    volumetric_energy_j_mm3: r.volumetricEnergyJMm3,
    relative_density_pct: r.relativeDensityPct,
    outcome: r.outcome,
    status: r.status,
    quality_score: r.qualityScore,
    machine: r.machine,
    location_page: r.locationPage,
    location_label: r.locationLabel,
    import_row: r.importRow,
    updated_at: r.updatedAt,
  };
}
