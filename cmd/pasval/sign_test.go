package main

// Signed records: a standard PDF signature appended after the record
// (ISO 32000-1 §12.8, incremental update), which verify checks besides the
// re-render. The key and certificate are made here, self-signed, for the test.

import (
	"bytes"
	"crypto/ecdsa"
	"crypto/elliptic"
	"crypto/rand"
	"crypto/x509"
	"crypto/x509/pkix"
	"encoding/pem"
	"math/big"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// testSigner writes a self-signed P-256 key and certificate into dir.
func testSigner(t *testing.T, dir string) (keyPath, certPath string) {
	t.Helper()
	key, err := ecdsa.GenerateKey(elliptic.P256(), rand.Reader)
	if err != nil {
		t.Fatal(err)
	}
	tmpl := &x509.Certificate{SerialNumber: big.NewInt(1), Subject: pkix.Name{CommonName: "Test Reviewer"},
		NotBefore: time.Now().Add(-time.Hour), NotAfter: time.Now().Add(24 * time.Hour), KeyUsage: x509.KeyUsageDigitalSignature}
	der, err := x509.CreateCertificate(rand.Reader, tmpl, tmpl, &key.PublicKey, key)
	if err != nil {
		t.Fatal(err)
	}
	kder, err := x509.MarshalPKCS8PrivateKey(key)
	if err != nil {
		t.Fatal(err)
	}
	keyPath, certPath = filepath.Join(dir, "key.pem"), filepath.Join(dir, "cert.pem")
	if err := os.WriteFile(keyPath, pem.EncodeToMemory(&pem.Block{Type: "PRIVATE KEY", Bytes: kder}), 0o600); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(certPath, pem.EncodeToMemory(&pem.Block{Type: "CERTIFICATE", Bytes: der}), 0o644); err != nil {
		t.Fatal(err)
	}
	return keyPath, certPath
}

func TestSignedRecord(t *testing.T) {
	dir := t.TempDir()
	key, cert := testSigner(t, dir)
	rec := filepath.Join(dir, "signed.pdf")
	out, errs, code := runBinary(t, "report", filepath.Join(demoDir, "htst-milk-si.yaml"), "-o", rec, "--date", "2026-12-01", "--sign", key, "--cert", cert)
	if code != 0 || !strings.Contains(out, "signed by Test Reviewer") {
		t.Fatalf("report --sign: exit %d %s%s", code, out, errs)
	}
	out, _, code = runBinary(t, "verify", rec)
	for _, want := range []string{"Test Reviewer (CN=Test Reviewer): valid", "does not chain to a root this system trusts",
		"followed by its signatures", "MATCH"} {
		if !strings.Contains(out, want) {
			t.Errorf("verify of a signed record lacks %q", want)
		}
	}
	if code != 0 {
		t.Errorf("verify of a signed record: exit %d\n%s", code, out)
	}
	pdf, err := os.ReadFile(rec)
	if err != nil {
		t.Fatal(err)
	}
	tampered := filepath.Join(dir, "tampered.pdf")
	for _, c := range []struct {
		name string
		edit func([]byte) []byte
		want string
	}{
		// A byte of the signed record changed (the title in the metadata, same length).
		{"signed byte changed", func(b []byte) []byte {
			i := bytes.Index(b, []byte("/Title ("))
			b = append([]byte(nil), b...)
			b[i+9] ^= 0x01
			return b
		}, "DIFFER"},
		// Bytes appended after the signature: not covered by it.
		{"appended after signing", func(b []byte) []byte { return append(append([]byte(nil), b...), "\n% added\n"...) }, "added after the last signature"},
	} {
		t.Run(c.name, func(t *testing.T) {
			if err := os.WriteFile(tampered, c.edit(pdf), 0o644); err != nil {
				t.Fatal(err)
			}
			out, errs, code := runBinary(t, "verify", tampered)
			if code != 1 || !strings.Contains(out, c.want) || !strings.Contains(out, "MISMATCH") {
				t.Errorf("exit %d, want 1 and %q:\n%s%s", code, c.want, out, errs)
			}
		})
	}
	// --sign without --cert is a usage error.
	if _, errs, code := runBinary(t, "report", filepath.Join(demoDir, "htst-milk-si.yaml"), "-o", filepath.Join(dir, "x.pdf"), "--sign", key); code != 2 ||
		!strings.Contains(errs, "--sign and --cert go together") {
		t.Errorf("--sign alone: exit %d %s", code, errs)
	}
}
