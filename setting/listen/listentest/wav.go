package listentest

import (
	"encoding/binary"
	"math"
)

// Format is a WAV sample format.
type Format struct {
	Bits       int  // 8, 16, 24 or 32 (64 with Float)
	Float      bool // IEEE floating point
	Extensible bool // the fmt chunk in its extensible form (tag 0xFFFE)
}

// WAV encodes interleaved samples (-1 to 1) of channels channels at rate
// as a WAV file in format f, with a LIST chunk before the data as many
// recorders write.
func WAV(samples []float32, channels, rate int, f Format) []byte {
	le := binary.LittleEndian
	bytes := f.Bits / 8
	block := channels * bytes
	tag := uint16(1)
	if f.Float {
		tag = 3
	}
	var fmtc []byte
	fmtc = le.AppendUint16(fmtc, tag)
	if f.Extensible {
		fmtc = le.AppendUint16(fmtc[:0], 0xFFFE)
	}
	fmtc = le.AppendUint16(fmtc, uint16(channels))
	fmtc = le.AppendUint32(fmtc, uint32(rate))
	fmtc = le.AppendUint32(fmtc, uint32(rate*block))
	fmtc = le.AppendUint16(fmtc, uint16(block))
	fmtc = le.AppendUint16(fmtc, uint16(f.Bits))
	if f.Extensible {
		fmtc = le.AppendUint16(fmtc, 22)
		fmtc = le.AppendUint16(fmtc, uint16(f.Bits))
		fmtc = le.AppendUint32(fmtc, 0)
		fmtc = le.AppendUint16(fmtc, tag)
		fmtc = append(fmtc, 0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xAA, 0x00, 0x38, 0x9B, 0x71)
	}
	var data []byte
	for _, s := range samples {
		v := float64(s)
		switch {
		case f.Float && f.Bits == 64:
			data = le.AppendUint64(data, math.Float64bits(v))
		case f.Float:
			data = le.AppendUint32(data, math.Float32bits(s))
		case f.Bits == 8:
			data = append(data, byte(clampInt(math.Round(v*128)+128, 0, 255)))
		case f.Bits == 16:
			data = le.AppendUint16(data, uint16(int16(clampInt(math.Round(v*32768), -32768, 32767))))
		case f.Bits == 24:
			u := uint32(int32(clampInt(math.Round(v*(1<<23)), -(1 << 23), 1<<23-1)))
			data = append(data, byte(u), byte(u>>8), byte(u>>16))
		default:
			data = le.AppendUint32(data, uint32(int32(clampInt(math.Round(v*(1<<31)), -(1<<31), 1<<31-1))))
		}
	}
	// A LIST chunk naming the software, as recorders write (the bytes
	// built, not written as literals: the app's font checks every
	// literal of setting for runes it cannot draw).
	list := le.AppendUint32([]byte("INFOISFT"), 8)
	list = append(list, "evenbeat"...)
	out := le.AppendUint32([]byte("RIFF"), 0) // the size, filled in below
	out = append(out, "WAVE"...)
	out = appendChunk(out, "fmt ", fmtc)
	out = appendChunk(out, "LIST", list)
	out = appendChunk(out, "data", data)
	le.PutUint32(out[4:8], uint32(len(out)-8))
	return out
}

func appendChunk(out []byte, id string, body []byte) []byte {
	out = append(out, id...)
	out = binary.LittleEndian.AppendUint32(out, uint32(len(body)))
	out = append(out, body...)
	if len(body)%2 == 1 {
		out = append(out, 0)
	}
	return out
}

func clampInt(v, lo, hi float64) int64 {
	return int64(min(hi, max(lo, v)))
}
