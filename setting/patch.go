package setting

import (
	"slices"

	"evenbeat/setting/jsonx"
)

// EnginePatch is a change to an engine written in the engine file's own
// terms: an RFC 7396 JSON Merge Patch of the engine object, such as
// {"valve": {"front": {"steam_lap": 2.5}}}. An object merges into the
// object at its key, null takes a key out, any other value (a number, a
// word, a list) replaces what the key held. A session file gives one for
// each cylinder built unlike the engine as a whole.
//
// ReadEnginePatch parses the patch once. Apply then reads it onto a copy
// of an EngineSpec's values with the engine reader's own rules, giving the
// engine, or the error, that merging the patch into the engine's JSON and
// reading that back would give, without writing or reading the engine as
// JSON: a cylinder's engine is made as often as a plan is, from the engine
// as it is then.
//
// The zero EnginePatch changes nothing. An EnginePatch is never changed
// once read, so copies may be shared.
type EnginePatch struct {
	text []byte       // the patch as read
	root *jsonx.Value // parsed; nil for the zero EnginePatch
}

// ReadEnginePatch reads an engine patch from its JSON, which must be one
// object, each key written once. Keys the engine format does not know and
// values of the wrong kind are refused by Apply, in the order reading the
// merged engine would meet them.
func ReadEnginePatch(data []byte) (EnginePatch, error) {
	data = slices.Clone(data)
	v, err := jsonx.Parse(data, jsonx.Options{NoDuplicates: true})
	if err != nil || v.Kind != jsonx.Object {
		return EnginePatch{}, &Error{"", "The engine's differences must be one JSON object of the engine fields that differ, each written once, such as {\"valve\": {\"front\": {\"steam_lap\": 2.5}}}."}
	}
	return EnginePatch{text: data, root: v}, nil
}

// IsEmpty reports whether the patch has no keys, and so changes nothing:
// the zero EnginePatch, or the patch {}.
func (p *EnginePatch) IsEmpty() bool { return p.root == nil || len(p.root.Keys) == 0 }

// JSON returns the patch as it was read; nil for the zero EnginePatch.
// The caller must not change it.
func (p *EnginePatch) JSON() []byte { return p.text }

// Apply returns spec with the patch applied, validated. spec itself is
// left alone; the result shares with it the lists and gear objects the
// patch leaves as they are (an empty patch returns spec as it is), so
// treat it as read-only. Errors are *Error values whose Field is the key
// path from the top of the engine ("valve.front.steam_lap"), as
// DecodeEngineSpec gives; a refused value is quoted as the patch writes
// it.
func (p *EnginePatch) Apply(spec EngineSpec) (EngineSpec, error) {
	if p.IsEmpty() {
		return spec, nil
	}
	d := specDecoder{data: p.text, patch: mergeInto}
	if err := d.read("", p.root, &spec); err != nil {
		return EngineSpec{}, err
	}
	if d.wholeErr != nil {
		return EngineSpec{}, d.wholeErr
	}
	if err := spec.Validate(); err != nil {
		return EngineSpec{}, err
	}
	return spec, nil
}
