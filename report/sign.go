package report

import (
	"bytes"
	"crypto"
	"crypto/x509"
	"encoding/pem"
	"errors"
	"fmt"
	"regexp"
	"strconv"
	"time"

	"github.com/digitorus/pdf"
	"github.com/digitorus/pdfsign/sign"
	"github.com/digitorus/pdfsign/verify"
)

// A record may carry standard PDF signatures (ISO 32000 digital signatures,
// PKCS#7 detached, adbe.pkcs7.detached under Adobe.PPKLite), each appended as
// an incremental update: the unsigned record stays, byte for byte, at the
// start of the signed file, so verify can still compare it with a re-render.

// SignInfo names who signs and why.
type SignInfo struct {
	Name, Reason, Location string
	Time                   time.Time
}

// ParseSigner reads a private key (PKCS#8, or PKCS#1 RSA, or SEC 1 EC, PEM
// encoded) and its certificate chain (PEM, the signer's certificate first).
func ParseSigner(keyPEM, certPEM []byte) (crypto.Signer, []*x509.Certificate, error) {
	kb, _ := pem.Decode(keyPEM)
	if kb == nil {
		return nil, nil, errors.New("the key file holds no PEM block")
	}
	var key any
	var err error
	switch kb.Type {
	case "RSA PRIVATE KEY":
		key, err = x509.ParsePKCS1PrivateKey(kb.Bytes)
	case "EC PRIVATE KEY":
		key, err = x509.ParseECPrivateKey(kb.Bytes)
	default:
		key, err = x509.ParsePKCS8PrivateKey(kb.Bytes)
	}
	if err != nil {
		return nil, nil, fmt.Errorf("the key cannot be read: %v", err)
	}
	signer, ok := key.(crypto.Signer)
	if !ok {
		return nil, nil, errors.New("the key cannot sign")
	}
	var chain []*x509.Certificate
	for rest := certPEM; ; {
		var b *pem.Block
		b, rest = pem.Decode(rest)
		if b == nil {
			break
		}
		if b.Type != "CERTIFICATE" {
			continue
		}
		c, err := x509.ParseCertificate(b.Bytes)
		if err != nil {
			return nil, nil, fmt.Errorf("a certificate cannot be read: %v", err)
		}
		chain = append(chain, c)
	}
	if len(chain) == 0 {
		return nil, nil, errors.New("the certificate file holds no certificate")
	}
	return signer, chain, nil
}

// Sign appends a PDF signature of key (certificate chain[0]) to a record.
func Sign(record []byte, key crypto.Signer, chain []*x509.Certificate, info SignInfo) ([]byte, error) {
	rdr, err := pdf.NewReader(bytes.NewReader(record), int64(len(record)))
	if err != nil {
		return nil, fmt.Errorf("report: the record cannot be read for signing: %w", err)
	}
	data := sign.SignData{
		Signature: sign.SignDataSignature{CertType: sign.ApprovalSignature,
			Info: sign.SignDataSignatureInfo{Name: info.Name, Reason: info.Reason, Location: info.Location, Date: info.Time}},
		Signer: key, DigestAlgorithm: crypto.SHA256, Certificate: chain[0],
	}
	if len(chain) > 1 {
		data.CertificateChains = [][]*x509.Certificate{chain}
	}
	var out bytes.Buffer
	if err := sign.Sign(bytes.NewReader(record), &out, rdr, int64(len(record)), data); err != nil {
		return nil, fmt.Errorf("report: signing: %w", err)
	}
	return out.Bytes(), nil
}

// Signature is one signature found in a record.
type Signature struct {
	Name    string // the signer's name as the signature gives it
	Subject string // the certificate's subject
	Valid   bool   // the digest and the PKCS#7 signature check out
	Trusted bool   // the certificate chains to a root the system trusts
	Time    *time.Time
}

// Signatures is what a record's signatures say.
type Signatures struct {
	List []Signature
	// Whole is true when every signature dictionary found checks out and the
	// last covers the whole file, so nothing was appended after signing.
	Whole bool
	// Found is the number of signature dictionaries (ByteRange entries).
	Found int
}

var byteRangeRe = regexp.MustCompile(`/ByteRange\s*\[\s*(\d+)\s+(\d+)\s+(\d+)\s+(\d+)\s*\]`)

// Signed reports whether a PDF carries a signature dictionary.
func Signed(record []byte) bool { return byteRangeRe.Match(record) }

// ReadSignatures checks every signature of a record. Certificates are taken
// as they come (a self-signed one is reported, not refused: Trusted says
// whether it chains to a trusted root); no revocation is looked up.
func ReadSignatures(record []byte) (Signatures, error) {
	var s Signatures
	ranges := byteRangeRe.FindAllSubmatch(record, -1)
	s.Found = len(ranges)
	if s.Found == 0 {
		return s, nil
	}
	resp, err := verify.VerifyWithOptions(bytes.NewReader(record), int64(len(record)), &verify.VerifyOptions{AllowUntrustedRoots: true,
		AllowedEKUs: []x509.ExtKeyUsage{x509.ExtKeyUsageAny}})
	if err != nil || resp == nil {
		return s, fmt.Errorf("the signatures cannot be checked (%v): %w", err, ErrUnreadable)
	}
	allValid := true
	for _, sg := range resp.Signers {
		x := Signature{Name: sg.Name, Valid: sg.ValidSignature, Trusted: sg.TrustedIssuer, Time: sg.SignatureTime}
		if len(sg.Certificates) > 0 && sg.Certificates[0].Certificate != nil {
			x.Subject = sg.Certificates[0].Certificate.Subject.String()
		}
		allValid = allValid && x.Valid
		s.List = append(s.List, x)
	}
	end := 0
	for _, r := range ranges {
		c, err1 := strconv.Atoi(string(r[3]))
		d, err2 := strconv.Atoi(string(r[4]))
		if err1 == nil && err2 == nil {
			end = max(end, c+d)
		}
	}
	s.Whole = allValid && len(s.List) == s.Found && end == len(record)
	return s, nil
}

// annotSubtypes are the annotation subtypes of each page.
func annotSubtypes(record []byte) ([][]string, error) {
	ctx, err := readContext(record)
	if err != nil {
		return nil, err
	}
	var out [][]string
	for p := 1; p <= ctx.PageCount; p++ {
		d, _, _, err := ctx.PageDict(p, false)
		if err != nil || d == nil {
			return nil, fmt.Errorf("page %d cannot be read: %w", p, ErrUnreadable)
		}
		var subs []string
		if o, found := d.Find("Annots"); found {
			arr, err := ctx.DereferenceArray(o)
			if err != nil {
				return nil, fmt.Errorf("page %d's annotations cannot be read: %w", p, ErrUnreadable)
			}
			for _, a := range arr {
				ad, err := ctx.DereferenceDict(a)
				if err != nil || ad == nil {
					subs = append(subs, "?")
					continue
				}
				st := "?"
				if n := ad.NameEntry("Subtype"); n != nil {
					st = *n
				}
				if ft := ad.NameEntry("FT"); st == "Widget" && (ft == nil || *ft != "Sig") {
					st = "Widget (not a signature)"
				}
				subs = append(subs, st)
			}
		}
		out = append(out, subs)
	}
	return out, nil
}

// OnlySignatureAnnotations reports whether every annotation of a record is a
// signature field: signing adds nothing else a reader would see. It returns
// the first page with another annotation.
func OnlySignatureAnnotations(record []byte) (bool, int, error) {
	pages, err := annotSubtypes(record)
	if err != nil {
		return false, 0, err
	}
	for i, subs := range pages {
		for _, s := range subs {
			if s != "Widget" {
				return false, i + 1, nil
			}
		}
	}
	return true, 0, nil
}
