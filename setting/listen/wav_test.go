package listen_test

import (
	"bytes"
	"encoding/binary"
	"errors"
	"io"
	"math"
	"strings"
	"testing"

	"evenbeat/setting/listen"
	"evenbeat/setting/listen/listentest"
)

// TestReadWAVForms reads one stereo ramp in every form the reader takes and
// checks the channels are averaged and the samples scaled to -1..1 within
// the form's step.
func TestReadWAVForms(t *testing.T) {
	const frames = 300
	var stereo []float32 // left a ramp, right its half
	for i := range frames {
		v := float32(i-frames/2) / (frames / 2) * 0.9
		stereo = append(stereo, v, v/2)
	}
	forms := []listentest.Format{
		{Bits: 8}, {Bits: 16}, {Bits: 24}, {Bits: 32},
		{Bits: 32, Float: true}, {Bits: 64, Float: true},
		{Bits: 16, Extensible: true}, {Bits: 32, Float: true, Extensible: true},
	}
	for _, f := range forms {
		s, err := listen.ReadWAV(bytes.NewReader(listentest.WAV(stereo, 2, 22050, f)))
		if err != nil {
			t.Errorf("%+v: %v", f, err)
			continue
		}
		if s.Rate != 22050 || s.Channels != 2 || s.Bits != f.Bits || s.Float != f.Float || s.Truncated || len(s.Samples) != frames {
			t.Errorf("%+v: rate %d, %d channels, %d bits, float %v, truncated %v, %d samples", f, s.Rate, s.Channels, s.Bits, s.Float, s.Truncated, len(s.Samples))
			continue
		}
		step := 1.0 / 128 // 8-bit
		if f.Bits > 8 || f.Float {
			step = 1.0 / 32768
		}
		for i, v := range s.Samples {
			want := (float64(stereo[2*i]) + float64(stereo[2*i+1])) / 2
			if math.Abs(float64(v)-want) > step {
				t.Errorf("%+v: sample %d is %g, want %g (within %g)", f, i, v, want, step)
				break
			}
		}
	}
}

// TestReadWAVMono: a mono file keeps its samples.
func TestReadWAVMono(t *testing.T) {
	in := []float32{0, 0.5, -0.5, 0.25}
	s, err := listen.ReadWAV(bytes.NewReader(listentest.WAV(in, 1, 8000, listentest.Format{Bits: 32, Float: true})))
	if err != nil {
		t.Fatal(err)
	}
	for i, v := range s.Samples {
		if v != in[i] {
			t.Errorf("sample %d: %g, want %g", i, v, in[i])
		}
	}
	if got := s.Seconds(); got != 4.0/8000 {
		t.Errorf("Seconds() = %g, want %g", got, 4.0/8000)
	}
}

// patch returns a copy of b with bytes from off replaced by with.
func patch(b []byte, off int, with []byte) []byte {
	out := append([]byte(nil), b...)
	copy(out[off:], with)
	return out
}

func u16(v uint16) []byte { return binary.LittleEndian.AppendUint16(nil, v) }
func u32(v uint32) []byte { return binary.LittleEndian.AppendUint32(nil, v) }

// TestReadWAVRefusals: what the reader cannot take is refused with a
// sentence naming what is wrong, never a panic, and a hostile length is
// refused before anything is allocated for it.
func TestReadWAVRefusals(t *testing.T) {
	good := listentest.WAV(make([]float32, 100), 1, 16000, listentest.Format{Bits: 16})
	// Offsets in the file WAV writes: RIFF header 12, "fmt " chunk header
	// 8, then tag 20, channels 22, rate 24, block 32, bits 34.
	dataAt := bytes.Index(good, []byte("data"))
	cases := []struct {
		name string
		file []byte
		says string
	}{
		{"empty", nil, "too short to be a WAV"},
		{"not RIFF", []byte("ID3\x03\x00\x00\x00\x00\x00\x00\x00\x00 and an mp3"), "not a WAV recording"},
		{"RF64", patch(good, 0, []byte("RF64")), "large-file form"},
		{"not WAVE", patch(good, 8, []byte("AVI ")), `type "AVI "`},
		{"compressed", patch(good, 20, u16(85)), "compressed (format 85)"},
		{"12-bit", patch(patch(good, 34, u16(12)), 32, u16(2)), "12-bit samples"},
		{"16-bit float", patch(good, 20, u16(3)), "16-bit floating-point"},
		{"no channels", patch(good, 22, u16(0)), "0 channels"},
		{"twelve channels", patch(good, 22, u16(12)), "12 channels"},
		{"4000 Hz", patch(good, 24, u32(4000)), "sample rate is 4000 Hz"},
		{"96000 Hz", patch(good, 24, u32(96000)), "sample rate is 96000 Hz"},
		{"block size", patch(good, 32, u16(3)), "block size (3 bytes)"},
		{"no format", append([]byte("RIFF\x04\x00\x00\x00WAVE"), "data\x00\x00\x00\x00"...), "before its format chunk"},
		{"no data", good[:dataAt], `no sound data (no "data" chunk)`},
		{"data empty", patch(good[:dataAt+8], dataAt+4, u32(0)), "holds no sound"},
		{"eleven minutes", patch(good, dataAt+4, u32(2*16000*660)), "11.0 minutes long"},
		{"short format", patch(good, 16, u32(10)), "format chunk is 10 bytes"},
		{"cut in the format", good[:30], "ends inside its format chunk"},
	}
	for _, c := range cases {
		s, err := listen.ReadWAV(bytes.NewReader(c.file))
		var le *listen.Error
		switch {
		case err == nil:
			t.Errorf("%s: read %d samples, want a refusal saying %q", c.name, len(s.Samples), c.says)
		case !errors.As(err, &le) || le.Field != "recording":
			t.Errorf("%s: %v is not a refusal of the recording", c.name, err)
		case !strings.Contains(err.Error(), c.says):
			t.Errorf("%s: %q does not say %q", c.name, err, c.says)
		case !strings.HasSuffix(err.Error(), "."):
			t.Errorf("%s: %q is not a sentence", c.name, err)
		}
	}
}

// TestReadWAVCutShort: a file that ends before its data do keeps the whole
// samples it has and says it was cut short; one whose recorder never wrote
// the data's length (0 or 0xFFFFFFFF) is read to its end.
func TestReadWAVCutShort(t *testing.T) {
	good := listentest.WAV(make([]float32, 100), 1, 16000, listentest.Format{Bits: 16})
	s, err := listen.ReadWAV(bytes.NewReader(good[:len(good)-51]))
	if err != nil || !s.Truncated || len(s.Samples) != 74 {
		t.Errorf("cut file: %v, truncated %v, %d samples (want 74)", err, s != nil && s.Truncated, len(s.Samples))
	}
	dataAt := bytes.Index(good, []byte("data"))
	for _, size := range []uint32{0, 0xFFFFFFFF} {
		s, err := listen.ReadWAV(bytes.NewReader(patch(good, dataAt+4, u32(size))))
		if err != nil || s.Truncated || len(s.Samples) != 100 {
			t.Errorf("data length %#x: %v, %d samples", size, err, len(s.Samples))
		}
	}
}

// TestReadWAVOpenLengthBounded: a stream with no stated length is refused
// once it passes ten minutes, without reading it all.
func TestReadWAVOpenLengthBounded(t *testing.T) {
	head := listentest.WAV(nil, 1, 8000, listentest.Format{Bits: 8})
	dataAt := bytes.Index(head, []byte("data"))
	head = patch(head, dataAt+4, u32(0xFFFFFFFF))
	endless := io.MultiReader(bytes.NewReader(head), io.LimitReader(zeros{}, 8000*660))
	_, err := listen.ReadWAV(endless)
	if err == nil || !strings.Contains(err.Error(), "longer than 10 minutes") {
		t.Errorf("endless stream: %v", err)
	}
}

type zeros struct{}

func (zeros) Read(p []byte) (int, error) {
	for i := range p {
		p[i] = 128
	}
	return len(p), nil
}

// TestReadWAVFloatNotNumbers: NaN and infinities in a float file are held
// to silence and full scale, never passed on.
func TestReadWAVFloatNotNumbers(t *testing.T) {
	in := []float32{float32(math.NaN()), float32(math.Inf(1)), float32(math.Inf(-1)), 3}
	s, err := listen.ReadWAV(bytes.NewReader(listentest.WAV(in, 1, 8000, listentest.Format{Bits: 32, Float: true})))
	if err != nil {
		t.Fatal(err)
	}
	want := []float32{0, 1, -1, 1}
	for i, v := range s.Samples {
		if v != want[i] {
			t.Errorf("sample %d: %g, want %g", i, v, want[i])
		}
	}
}

// FuzzReadWAV: whatever the bytes, the reader refuses them with a sentence
// or gives finite samples from -1 to 1, never panicking; seeded with every
// form it reads and the refusals above.
func FuzzReadWAV(f *testing.F) {
	ramp := []float32{-1, -0.5, 0, 0.5, 1, 0.25}
	for _, form := range []listentest.Format{{Bits: 8}, {Bits: 16}, {Bits: 24}, {Bits: 32}, {Bits: 32, Float: true}, {Bits: 64, Float: true}, {Bits: 16, Extensible: true}} {
		f.Add(listentest.WAV(ramp, 2, 8000, form))
	}
	f.Add([]byte("RIFF\x04\x00\x00\x00WAVEdata\xff\xff\xff\xff"))
	f.Fuzz(func(t *testing.T, b []byte) {
		s, err := listen.ReadWAV(bytes.NewReader(b))
		if err != nil {
			var le *listen.Error
			if !errors.As(err, &le) || !strings.HasSuffix(le.Message, ".") {
				t.Fatalf("%v is not a refusal in a sentence", err)
			}
			return
		}
		if s.Rate < listen.MinRate || s.Rate > listen.MaxRate || len(s.Samples) == 0 {
			t.Fatalf("rate %d, %d samples", s.Rate, len(s.Samples))
		}
		for _, v := range s.Samples {
			if !(v >= -1 && v <= 1) {
				t.Fatalf("sample %g", v)
			}
		}
	})
}
