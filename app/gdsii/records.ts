/**
 * Record types and data types of the GDSII Stream Format Manual, release 6.0.
 * A record is a 2-byte length (header included), a 1-byte record type and a 1-byte data type.
 */
export const RecordType = {
  HEADER: 0x00,
  BGNLIB: 0x01,
  LIBNAME: 0x02,
  UNITS: 0x03,
  ENDLIB: 0x04,
  BGNSTR: 0x05,
  STRNAME: 0x06,
  ENDSTR: 0x07,
  BOUNDARY: 0x08,
  PATH: 0x09,
  SREF: 0x0a,
  AREF: 0x0b,
  TEXT: 0x0c,
  LAYER: 0x0d,
  DATATYPE: 0x0e,
  WIDTH: 0x0f,
  XY: 0x10,
  ENDEL: 0x11,
  SNAME: 0x12,
  COLROW: 0x13,
  TEXTNODE: 0x14,
  NODE: 0x15,
  TEXTTYPE: 0x16,
  PRESENTATION: 0x17,
  SPACING: 0x18,
  STRING: 0x19,
  STRANS: 0x1a,
  MAG: 0x1b,
  ANGLE: 0x1c,
  UINTEGER: 0x1d,
  USTRING: 0x1e,
  REFLIBS: 0x1f,
  FONTS: 0x20,
  PATHTYPE: 0x21,
  GENERATIONS: 0x22,
  ATTRTABLE: 0x23,
  STYPTABLE: 0x24,
  STRTYPE: 0x25,
  ELFLAGS: 0x26,
  ELKEY: 0x27,
  LINKTYPE: 0x28,
  LINKKEYS: 0x29,
  NODETYPE: 0x2a,
  PROPATTR: 0x2b,
  PROPVALUE: 0x2c,
  BOX: 0x2d,
  BOXTYPE: 0x2e,
  PLEX: 0x2f,
  BGNEXTN: 0x30,
  ENDEXTN: 0x31,
  TAPENUM: 0x32,
  TAPECODE: 0x33,
  STRCLASS: 0x34,
  RESERVED: 0x35,
  FORMAT: 0x36,
  MASK: 0x37,
  ENDMASKS: 0x38,
  LIBDIRSIZE: 0x39,
  SRFNAME: 0x3a,
  LIBSECUR: 0x3b,
} as const;

/** Highest record type the manual defines; anything above is not GDSII. */
export const LAST_RECORD_TYPE = RecordType.LIBSECUR;

const NAMES: string[] = [];
for (const [name, code] of Object.entries(RecordType)) NAMES[code] = name;

export function recordTypeName(type: number): string {
  return NAMES[type] ?? `0x${type.toString(16).padStart(2, "0")}`;
}

export const DataType = {
  NONE: 0,
  BITARRAY: 1,
  INT16: 2,
  INT32: 3,
  REAL4: 4,
  REAL8: 5,
  ASCII: 6,
} as const;

/** STRANS bits (bit 0 is the most significant bit of the word, as the manual numbers them). */
export const STRANS_REFLECT = 0x8000;
export const STRANS_ABS_MAG = 0x0004;
export const STRANS_ABS_ANGLE = 0x0002;

/** Largest payload a record can carry: the length field is 16 bits and counts the 4 header bytes. */
export const MAX_RECORD_BYTES = 0xfffe;
