// Package snapshot reads and writes snapshot files: the compressed,
// checksummed record of the evolving state of one coupled simulation run.
//
// A snapshot holds a header (the run's identity, its map placement, the
// element geometry and the names and units of the recorded fields) followed
// by frames taken at the output interval. A frame holds the time, the stage
// index, one float32 value per element for each recorded field (for example
// pressure, aperture and slip) and one flags byte per element. A trailing
// index gives random access to the frames.
//
// The package knows nothing of the simulator: it stores plain arrays. The
// names [FieldPressure], [FieldAperture] and [FieldSlip] and the flag bits
// [FlagSlipping], [FlagSlipped], [FlagOpen], [FlagStimulated] and [FlagIntact] are the
// conventions that [WriteFrameCSV] and the simulator share.
//
// # Robustness
//
// [Writer.WriteFrame] hands each frame to the underlying io.Writer in one
// Write call, so a run that crashes keeps every frame written before the
// crash. Every block carries CRC-32C checksums. When the footer or the index
// is missing or damaged, [NewReader] recovers every complete, intact frame by
// scanning the file from the start, skips damaged frames, stops cleanly at a
// cut frame, and says what it did through [Reader.Recovered] and
// [Reader.Note]. Readers never panic on corrupt input: they return an error
// that matches [ErrFormat] (a [*FormatError] carrying the byte offset), an
// [*UnsupportedError] for a newer format version, or io.ErrUnexpectedEOF when
// the file ends inside its header.
//
// Memory use while reading is bounded: every count is checked against a
// fixed limit ([MaxElements], [MaxFields], [MaxMetadata], [MaxStringLen])
// and against the file size before anything is allocated, every array's
// decoded size must be reachable from its stored size (a zstd block expands
// at most 32768-fold: RFC 8878 §3.1.1.2 limits a block to 128 KiB of content
// and the smallest block, an RLE block, takes 4 bytes), and the zstd decoder
// runs with memory and window limits.
//
// # File format
//
// All integers are little-endian. A float64 or float32 is stored as the bits
// of its IEEE 754 binary64 or binary32 value in an unsigned integer of the
// same width, so values round-trip bit for bit (NaN payloads, infinities,
// signed zeros and subnormals included). Offsets count bytes from the start
// of the file. CRC-32C is the 32-bit cyclic redundancy check with the
// Castagnoli polynomial (reflected 0x82F63B78, initial value and final XOR
// 0xFFFFFFFF), the one used by iSCSI (RFC 3720).
//
//	file = preamble header-block frame-block* [index-block footer]
//
// The preamble is 16 bytes at offset 0; its layout is the same in every
// format version:
//
//	offset  size  field
//	0       8     magic: 89 53 46 53 4E 50 0D 0A ("\x89SFSNP\r\n")
//	8       4     format version, uint32 (this package writes 1)
//	12      4     CRC-32C of bytes 0–11
//
// As in the PNG signature (W3C 2003, §5.2), the non-ASCII first byte and the
// CR LF pair reveal a file damaged by 7-bit or line-ending conversion.
//
// Every block has a 20-byte block header followed by its payload:
//
//	offset  size  field
//	0       4     tag: "SHDR" header, "SFRM" frame, "SIDX" index
//	4       8     payload length L, uint64
//	12      4     CRC-32C of the L payload bytes
//	16      4     CRC-32C of bytes 0–15 of this block header
//	20      L     payload
//
// The separate header checksum lets a scanning reader trust a block's length
// even when its payload is damaged, and so skip that block and go on.
//
// Inside payloads two composite items appear:
//
//	str    uint32 byte count n, then n bytes of UTF-8 (n ≤ MaxStringLen)
//	array  uint32 stored byte count m, then m bytes: one or more zstd
//	       frames (RFC 8878) whose concatenated content is the byte-shuffled
//	       array
//
// An array's length in elements is the header's element count n, so its
// decoded size is n times the value width w (8 for float64, 4 for float32
// and int32, 1 for flags). Byte shuffling groups the bytes of the values by
// significance: byte j (0 = least significant) of value i is stored at
// position j·n + i. Neighbouring values of a smooth field share their sign,
// exponent and leading mantissa bytes, so the shuffled stream holds long
// runs that zstd compresses well; this is the shuffle filter of HDF5 and
// Blosc (Alted 2010). Flags (w = 1) are not shuffled.
//
// The header block payload:
//
//	str       scenario digest (hex SHA-256 of the scenario, or empty)
//	uint64    seed
//	uint64    realization index
//	str       CRS of the origin, "EPSG:<code>", or empty for a local frame
//	float64   origin easting, m
//	float64   origin northing, m
//	float64   layer depth (TVD of the layer mid-plane), m
//	uint32    metadata pair count k (≤ MaxMetadata); then k × (str key,
//	          str value), keys non-empty and strictly increasing bytewise
//	uint32    element count n (≤ MaxElements)
//	uint32    frame field count f (≤ MaxFields); then f × (str name, str unit)
//	uint32    static field count s (≤ MaxFields); then s × (str name, str unit)
//	array     fracture id of each element, int32
//	array     x0, float64, m      (local east of the element's first end)
//	array     y0, float64, m      (local north of the element's first end)
//	array     x1, float64, m
//	array     y1, float64, m
//	array     conducting height, float64, m
//	array     length, float64, m
//	s × array static field values, int32, in header order
//
// A frame block payload:
//
//	uint32    sequence number: 0 for the first frame written, then 1, 2, …
//	float64   time since the start of the schedule, s
//	int32     stage index
//	f × array frame field values, float32, in header order
//	array     flags, one byte per element
//
// Frames follow each other directly, the first one right after the header
// block, in non-decreasing time order.
//
// The index block payload, written by [Writer.Close]:
//
//	uint32    frame count c; then c × 28-byte entries:
//	uint64      offset of the frame block
//	uint64      size of the frame block, 20 + L
//	float64     time, s
//	int32       stage index
//
// The footer, the last 24 bytes of a complete file:
//
//	offset  size  field
//	0       8     offset of the index block, uint64
//	8       4     frame count, uint32
//	12      4     CRC-32C of bytes 0–11
//	16      8     end magic: 89 53 46 45 4E 44 0D 0A ("\x89SFEND\r\n")
//
// A payload must be consumed exactly; trailing bytes are a format error.
// Flag bits 5–7 are reserved: written as 0 by this version and ignored by
// readers.
//
// # Units
//
// Coordinates and lengths in metres in the local East-North frame of the
// scenario origin; depth in metres, positive down; time in seconds since the
// start of the schedule. Each field carries its unit as a string ("Pa", "m");
// [WriteFrameCSV] and [DescribeFrame] convert pressure to MPa and aperture
// and slip to mm.
//
// # Conventions
//
// Element i of every array is the element with identifier i (0-based). The
// stage index and the fracture identifiers are the writer's own; by
// convention a stage index of -1 means "no stage" (before the first stage
// or during a shut-in). Metadata is free-form: for example the program
// version and the schedule start time. One key is read by the inspection:
// [MetaStageNames], the stage names as a JSON array in stage-index order,
// so that frames are listed by stage name.
//
// # Inspection
//
// [Describe] lists a snapshot's header and frames, [DescribeFrame]
// summarizes one frame, and [WriteFrameCSV] writes one frame per element as
// CSV; all three write to an io.Writer.
//
// # References
//
//   - Collet, Y., Kucherawy, M. (2021). Zstandard Compression and the
//     'application/zstd' Media Type. RFC 8878. doi:10.17487/RFC8878.
//   - Castagnoli, G., Bräuer, S., Herrmann, M. (1993). Optimization of cyclic
//     redundancy-check codes with 24 and 32 parity bits. IEEE Transactions on
//     Communications 41(6), 883–892. doi:10.1109/26.231911.
//   - Satran, J. et al. (2004). Internet Small Computer Systems Interface
//     (iSCSI). RFC 3720, §12.1 and Appendix B.4 (CRC-32C and its test
//     vectors). doi:10.17487/RFC3720.
//   - W3C (2003). Portable Network Graphics (PNG) Specification, Second
//     Edition, §5.2 PNG signature. (ISO/IEC 15948:2004.)
//   - Alted, F. (2010). Why modern CPUs are starving and what can be done
//     about it. Computing in Science & Engineering 12(2), 68–71.
//     doi:10.1109/MCSE.2010.51. (Blosc and its shuffle filter.)
package snapshot
