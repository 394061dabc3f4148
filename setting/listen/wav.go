package listen

import (
	"encoding/binary"
	"io"
	"math"
)

// Sound is a recording read from a WAV file: mono samples from -1 to 1 at
// Rate samples a second, with what the file held.
type Sound struct {
	Samples  []float32 // mono; channels are averaged
	Rate     int       // samples a second
	Channels int       // channels in the file, averaged into Samples
	Bits     int       // bits a sample in the file
	Float    bool      // the file held floating-point samples
	// Truncated is set when the file ended before the length its sound
	// data declared: the whole samples present are kept, and a caller
	// should say the recording was cut short.
	Truncated bool
}

// Seconds is the length of the sound.
func (s *Sound) Seconds() float64 {
	if s.Rate <= 0 {
		return 0
	}
	return float64(len(s.Samples)) / float64(s.Rate)
}

// The bounds of a recording the analysis takes.
const (
	MinRate    = 8000  // samples a second, the least
	MaxRate    = 48000 // samples a second, the most
	MaxSeconds = 600   // ten minutes: far more than any run on blocks needs
	maxChans   = 8
)

// WAV format tags (the fmt chunk's first field).
const (
	formatPCM        = 1
	formatFloat      = 3
	formatExtensible = 0xFFFE
)

// ReadWAV reads a WAV file: PCM of 8, 16, 24 or 32 bits, or 32- or 64-bit
// floating point, in one to eight channels (averaged into one), at 8000 to
// 48000 samples a second and at most ten minutes long. Anything else is
// refused with a sentence naming what is wrong. The length is checked
// against MaxSeconds before the samples are read, so a hostile header
// cannot make it allocate more than ten minutes' worth.
func ReadWAV(r io.Reader) (*Sound, error) {
	var head [12]byte
	if _, err := io.ReadFull(r, head[:]); err != nil {
		return nil, refuse("The file is too short to be a WAV recording (it ends inside its first 12 bytes).")
	}
	switch string(head[0:4]) {
	case "RIFF":
	case "RF64", "BW64":
		return nil, refuse("The file is a WAV recording in the large-file form (RF64), which is only needed beyond 4 GB; save it as an ordinary WAV of at most ten minutes.")
	default:
		return nil, refuse("The file is not a WAV recording (it does not start with RIFF); save or export the recording as WAV.")
	}
	if string(head[8:12]) != "WAVE" {
		return nil, refuse("The file is a RIFF file of type %q, not a WAV recording; save or export the recording as WAV.", printable(head[8:12]))
	}
	var f *wavFormat
	for {
		var ch [8]byte
		if _, err := io.ReadFull(r, ch[:]); err != nil {
			if f == nil {
				return nil, refuse("The WAV file has no format chunk (\"fmt \"); the file is damaged or not a WAV recording.")
			}
			return nil, refuse("The WAV file has no sound data (no \"data\" chunk); the recording may have failed.")
		}
		id, size := string(ch[0:4]), binary.LittleEndian.Uint32(ch[4:8])
		switch id {
		case "fmt ":
			if f != nil {
				return nil, refuse("The WAV file has two format chunks; the file is damaged.")
			}
			if size < 16 || size > 1024 {
				return nil, refuse("The WAV file's format chunk is %d bytes long, where 16 to 40 are usual; the file is damaged.", size)
			}
			b := make([]byte, size+size%2)
			if _, err := io.ReadFull(r, b); err != nil {
				return nil, refuse("The WAV file ends inside its format chunk; the file is cut short.")
			}
			var err error
			if f, err = parseFormat(b[:size]); err != nil {
				return nil, err
			}
		case "data":
			if f == nil {
				return nil, refuse("The WAV file's sound data come before its format chunk, so the samples cannot be read; the file is damaged.")
			}
			return readData(r, f, size)
		default:
			if _, err := io.CopyN(io.Discard, r, int64(size)+int64(size%2)); err != nil {
				if f == nil {
					return nil, refuse("The WAV file has no format chunk (\"fmt \"); the file is damaged or not a WAV recording.")
				}
				return nil, refuse("The WAV file has no sound data (no \"data\" chunk); the recording may have failed.")
			}
		}
	}
}

// wavFormat is what the fmt chunk says.
type wavFormat struct {
	channels, rate, bits, block int
	float                       bool
}

// parseFormat reads and checks a fmt chunk's body.
func parseFormat(b []byte) (*wavFormat, error) {
	le := binary.LittleEndian
	tag := le.Uint16(b[0:2])
	f := &wavFormat{
		channels: int(le.Uint16(b[2:4])),
		rate:     int(le.Uint32(b[4:8])),
		block:    int(le.Uint16(b[12:14])),
		bits:     int(le.Uint16(b[14:16])),
	}
	if tag == formatExtensible {
		if len(b) < 26 {
			return nil, refuse("The WAV file says its format is extensible but its format chunk is too short to say which; the file is damaged.")
		}
		tag = le.Uint16(b[24:26]) // the sub-format GUID starts with the plain tag
	}
	switch tag {
	case formatPCM:
		if f.bits != 8 && f.bits != 16 && f.bits != 24 && f.bits != 32 {
			return nil, refuse("The WAV file holds %d-bit samples; save it as 16-bit (or 8, 24 or 32-bit) PCM.", f.bits)
		}
	case formatFloat:
		f.float = true
		if f.bits != 32 && f.bits != 64 {
			return nil, refuse("The WAV file holds %d-bit floating-point samples; save it as 32-bit float or 16-bit PCM.", f.bits)
		}
	default:
		return nil, refuse("The WAV file is compressed (format %d); save it as uncompressed PCM WAV, e.g. 16-bit.", tag)
	}
	if f.channels < 1 || f.channels > maxChans {
		return nil, refuse("The WAV file says it has %d channels; a recording of 1 to %d channels (mono or stereo) is needed.", f.channels, maxChans)
	}
	if f.rate < MinRate || f.rate > MaxRate {
		return nil, refuse("The WAV file's sample rate is %d Hz; record or save it at %d to %d Hz (44100 or 48000 are usual).", f.rate, MinRate, MaxRate)
	}
	if f.block != f.channels*f.bits/8 {
		return nil, refuse("The WAV file's block size (%d bytes) does not fit %d channels of %d bits; the file is damaged.", f.block, f.channels, f.bits)
	}
	return f, nil
}

// readData reads the data chunk of declared size, converting as it goes.
// A size of 0 or 0xFFFFFFFF (a recorder that never finished its header)
// means "to the end of the file".
func readData(r io.Reader, f *wavFormat, size uint32) (*Sound, error) {
	s := &Sound{Rate: f.rate, Channels: f.channels, Bits: f.bits, Float: f.float}
	limit := int64(MaxSeconds) * int64(f.rate) // frames
	open := size == 0 || size == 0xFFFFFFFF
	frames := int64(size) / int64(f.block)
	if !open && frames > limit {
		return nil, refuse("The recording is %.1f minutes long; at most %d minutes can be analysed: record or cut a shorter piece (half a minute is plenty).",
			float64(frames)/float64(f.rate)/60, MaxSeconds/60)
	}
	if open {
		frames = limit + 1
	}
	s.Samples = make([]float32, 0, min(frames, int64(f.rate)*30))
	buf := make([]byte, f.block*4096)
	for left := frames; left > 0; {
		want := min(left, int64(len(buf)/f.block)) * int64(f.block)
		n, err := io.ReadFull(r, buf[:want])
		whole := n / f.block
		s.Samples = appendFrames(s.Samples, buf[:whole*f.block], f)
		left -= int64(whole)
		if err != nil {
			if !open {
				s.Truncated = true
			}
			break
		}
	}
	if int64(len(s.Samples)) > limit {
		return nil, refuse("The recording is longer than %d minutes, the most that can be analysed: record or cut a shorter piece (half a minute is plenty).", MaxSeconds/60)
	}
	if len(s.Samples) == 0 {
		return nil, refuse("The WAV file holds no sound (its data chunk is empty); the recording may have failed.")
	}
	return s, nil
}

// appendFrames converts whole frames of b to mono samples.
func appendFrames(dst []float32, b []byte, f *wavFormat) []float32 {
	bytes := f.bits / 8
	for i := 0; i+f.block <= len(b); i += f.block {
		sum := 0.0
		for c := range f.channels {
			sum += sampleAt(b[i+c*bytes:], f)
		}
		v := sum / float64(f.channels)
		if !(v >= -1) || !(v <= 1) { // also NaN and Inf in a float file
			v = clampSample(v)
		}
		dst = append(dst, float32(v))
	}
	return dst
}

// sampleAt decodes one sample, -1 to 1 (floats as stored).
func sampleAt(b []byte, f *wavFormat) float64 {
	le := binary.LittleEndian
	switch {
	case f.float && f.bits == 32:
		return float64(math.Float32frombits(le.Uint32(b)))
	case f.float:
		return math.Float64frombits(le.Uint64(b))
	case f.bits == 8:
		return (float64(b[0]) - 128) / 128 // 8-bit WAV is unsigned
	case f.bits == 16:
		return float64(int16(le.Uint16(b))) / 32768
	case f.bits == 24:
		v := int32(uint32(b[0])<<8|uint32(b[1])<<16|uint32(b[2])<<24) >> 8
		return float64(v) / (1 << 23)
	default:
		return float64(int32(le.Uint32(b))) / (1 << 31)
	}
}

// clampSample holds a float sample to -1..1; NaN (a damaged float file)
// becomes silence rather than poisoning every figure after it.
func clampSample(v float64) float64 {
	switch {
	case v != v:
		return 0
	case v > 1:
		return 1
	case v < -1:
		return -1
	}
	return v
}

// printable shows four bytes of a header, with anything unprintable as '?'.
func printable(b []byte) string {
	out := make([]byte, len(b))
	for i, c := range b {
		if c < 32 || c > 126 {
			c = '?'
		}
		out[i] = c
	}
	return string(out)
}
