/**
 * Reads the source form's FormData into the input shape of sourceInputSchema. Shared by the
 * client (to validate with the same schema before sending) and the server action.
 */
export function sourceInputFromFormData(fd: FormData): Record<string, unknown> {
  const value = (name: string) => {
    const v = fd.get(name);
    return typeof v === "string" ? v : undefined;
  };
  const input: Record<string, unknown> = {
    kind: value("kind") || undefined,
    title: value("title") ?? "",
    authors: value("authors") ?? "",
    year: value("year") ?? "",
    venue: value("venue"),
    doi: value("doi"),
    url: value("url"),
    notes: value("notes"),
    densityMethod: value("densityMethod") || undefined,
    outcomeEvidence: value("outcomeEvidence") || undefined,
    // an empty choice means "not given", which the schema spells null
    spotSizeDefinition: value("spotSizeDefinition") || null,
    machineStated: fd.get("machineStated") === "on",
    powderReported: fd.get("powderReported") === "on",
    atmosphereReported: fd.get("atmosphereReported") === "on",
  };
  const id = value("id");
  const version = value("version");
  if (id !== undefined) input.id = id;
  if (version !== undefined) input.version = version;
  return input;
}
