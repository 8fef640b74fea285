/** The engineering caution every report and export carries. */
export const REPORT_CAUTION = 'Computed geometric properties; structural adequacy is for a licensed engineer under local codes.';
