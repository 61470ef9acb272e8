// Types for the parts of citation-js this project uses (the packages ship none).
declare module "@citation-js/core" {
  export interface CslName {
    given?: string;
    family?: string;
    literal?: string;
    "non-dropping-particle"?: string;
    "dropping-particle"?: string;
    suffix?: string;
  }
  export interface CslDate {
    "date-parts"?: (number | string)[][];
    raw?: string;
    literal?: string;
  }
  export interface CslItem {
    type?: string;
    title?: string;
    author?: CslName[];
    editor?: CslName[];
    issued?: CslDate;
    "event-date"?: CslDate;
    "container-title"?: string;
    "event-title"?: string;
    publisher?: string;
    genre?: string;
    DOI?: string;
    URL?: string;
    [key: string]: unknown;
  }
  export const plugins: {
    input: {
      chain(data: unknown, options?: { forceType?: string; generateGraph?: boolean; maxChainLength?: number; target?: string }): CslItem[];
    };
  };
}
declare module "@citation-js/plugin-bibtex";
declare module "@citation-js/plugin-ris";
