package article

import (
	"archive/zip"
	"encoding/xml"
	"fmt"
	"io"
	"net/url"
	"path"
	"strings"

	"coefaudit/extract"
)

// The relationship types of a package's main part, in the transitional and
// the strict conformance class (ECMA-376 Part 1, §11.3.10 and Part 2, §9).
const (
	relOfficeDocument       = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument"
	relOfficeDocumentStrict = "http://purl.oclc.org/ooxml/officeDocument/relationships/officeDocument"
)

// wordMainTypes are the content types of a WordprocessingML main part: a
// document, a template and their macro-enabled forms (ECMA-376 Part 1,
// §11.3.10; the macro-enabled ones are those Word writes).
var wordMainTypes = []string{
	"application/vnd.openxmlformats-officedocument.wordprocessingml.document.main+xml",
	"application/vnd.openxmlformats-officedocument.wordprocessingml.template.main+xml",
	"application/vnd.ms-word.document.macroEnabled.main+xml",
	"application/vnd.ms-word.template.macroEnabledTemplate.main+xml",
}

// maxPackagePart bounds the package parts read besides the document
// ([Content_Types].xml, _rels/.rels): they list a few parts each.
const maxPackagePart = 1 << 20

// mainPart finds a DOCX package's main document part as the Open
// Packaging Conventions say: the target of the package relationship
// (_rels/.rels) of type officeDocument, resolved against the package's
// root, and it must have a WordprocessingML content type in
// [Content_Types].xml (its Override, else the Default of its extension).
// Part names are compared without regard to ASCII case (Part 2, §9.1.1.1).
//
// References:
//
//	[1] ECMA International (2021). ECMA-376 Office Open XML File Formats,
//	    5th ed., Part 2: Open Packaging Conventions, §9.1 (part names),
//	    §9.3 (relationships, the package's in /_rels/.rels) and §10.1.2
//	    (the content types stream).
func mainPart(zr *zip.Reader, file string) (*zip.File, error) {
	members := map[string]*zip.File{}
	for _, m := range zr.File {
		members[strings.ToLower(strings.ReplaceAll(m.Name, "\\", "/"))] = m
	}
	notDOCX := func(why string) error {
		return fmt.Errorf("%s is a zip archive but not a DOCX manuscript: %s: %w", file, why, ErrNotArticle)
	}
	rels, ok := members["_rels/.rels"]
	if !ok {
		return nil, notDOCX("it has no package relationships (_rels/.rels)")
	}
	var r struct {
		Rels []struct {
			Type   string `xml:"Type,attr"`
			Target string `xml:"Target,attr"`
			Mode   string `xml:"TargetMode,attr"`
		} `xml:"Relationship"`
	}
	if err := readPackagePart(rels, &r); err != nil {
		return nil, fileError(file, err)
	}
	name := ""
	for _, rel := range r.Rels {
		if (rel.Type == relOfficeDocument || rel.Type == relOfficeDocumentStrict) && !strings.EqualFold(rel.Mode, "External") {
			name = rel.Target
			break
		}
	}
	if name == "" {
		return nil, notDOCX("_rels/.rels names no main document (officeDocument relationship)")
	}
	// The package relationships' source is the root: a relative target
	// is resolved against "/", and a part name is a path of the URI.
	if u, err := url.Parse(name); err == nil {
		name = u.Path
	}
	name = strings.TrimPrefix(path.Clean("/"+name), "/")
	doc, ok := members[strings.ToLower(name)]
	if !ok {
		return nil, notDOCX(fmt.Sprintf("its main document %s, named in _rels/.rels, is not in the archive", name))
	}
	ct, err := contentType(members, name)
	if err != nil {
		return nil, fileError(file, err)
	}
	for _, t := range wordMainTypes {
		if strings.EqualFold(ct, t) {
			return doc, nil
		}
	}
	if ct == "" {
		return nil, notDOCX(fmt.Sprintf("[Content_Types].xml gives its main part %s no content type", name))
	}
	return nil, notDOCX(fmt.Sprintf("its main part %s is %s, not a Word document", name, ct))
}

// contentType is the content type [Content_Types].xml gives the part name:
// its Override, else the Default of its extension; "" when none.
func contentType(members map[string]*zip.File, name string) (string, error) {
	m, ok := members["[content_types].xml"]
	if !ok {
		return "", nil
	}
	var types struct {
		Defaults []struct {
			Ext  string `xml:"Extension,attr"`
			Type string `xml:"ContentType,attr"`
		} `xml:"Default"`
		Overrides []struct {
			Part string `xml:"PartName,attr"`
			Type string `xml:"ContentType,attr"`
		} `xml:"Override"`
	}
	if err := readPackagePart(m, &types); err != nil {
		return "", err
	}
	for _, o := range types.Overrides {
		if strings.EqualFold(strings.TrimPrefix(o.Part, "/"), name) {
			return o.Type, nil
		}
	}
	ext := strings.TrimPrefix(path.Ext(name), ".")
	for _, d := range types.Defaults {
		if strings.EqualFold(d.Ext, ext) {
			return d.Type, nil
		}
	}
	return "", nil
}

// readPackagePart decodes a small XML part of the package into v, strictly
// and at most maxPackagePart bytes of it.
func readPackagePart(m *zip.File, v any) error {
	rc, err := m.Open()
	if err != nil {
		return fmt.Errorf("%s: %w", m.Name, err)
	}
	defer rc.Close()
	b, err := io.ReadAll(io.LimitReader(rc, maxPackagePart+1))
	if err != nil {
		return fmt.Errorf("%s: %w", m.Name, err)
	}
	if len(b) > maxPackagePart {
		return fmt.Errorf("%s is larger than %d KiB: %w", m.Name, maxPackagePart>>10, extract.ErrInputTooLarge)
	}
	if err := xml.Unmarshal(b, v); err != nil {
		return fmt.Errorf("%s: %v: %w", m.Name, err, extract.ErrUnsupportedInput)
	}
	return nil
}
