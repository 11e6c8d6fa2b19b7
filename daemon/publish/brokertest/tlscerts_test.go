package brokertest

import (
	"crypto/tls"
	"crypto/x509"
	"os"
	"testing"
)

func loadPool(t *testing.T, caFile string) *x509.CertPool {
	t.Helper()
	b, err := os.ReadFile(caFile)
	if err != nil {
		t.Fatal(err)
	}
	pool := x509.NewCertPool()
	if !pool.AppendCertsFromPEM(b) {
		t.Fatal("no certificate in CA file")
	}
	return pool
}

func leaf(t *testing.T, certFile, keyFile string) *x509.Certificate {
	t.Helper()
	kp, err := tls.LoadX509KeyPair(certFile, keyFile)
	if err != nil {
		t.Fatal(err)
	}
	c, err := x509.ParseCertificate(kp.Certificate[0])
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// The PKI verifies with Go's own x509 (the reference for what framed's
// publisher accepts): the server for its loopback names, the client for
// client authentication, and neither against another PKI's CA.
func TestWriteTestPKI(t *testing.T) {
	p, err := WriteTestPKI(t.TempDir())
	if err != nil {
		t.Fatal(err)
	}
	other, err := WriteTestPKI(t.TempDir())
	if err != nil {
		t.Fatal(err)
	}
	pool, otherPool := loadPool(t, p.CAFile), loadPool(t, other.CAFile)
	srv := leaf(t, p.ServerCertFile, p.ServerKeyFile)
	for _, name := range []string{"127.0.0.1", "localhost", "::1"} {
		if _, err := srv.Verify(x509.VerifyOptions{Roots: pool, DNSName: name}); err != nil {
			t.Errorf("server certificate for %s: %v", name, err)
		}
	}
	if _, err := srv.Verify(x509.VerifyOptions{Roots: pool, DNSName: "broker.example"}); err == nil {
		t.Error("server certificate verified for a name it does not carry")
	}
	if _, err := srv.Verify(x509.VerifyOptions{Roots: otherPool, DNSName: "127.0.0.1"}); err == nil {
		t.Error("server certificate verified against another CA")
	}
	cli := leaf(t, p.ClientCertFile, p.ClientKeyFile)
	if cli.Subject.CommonName != ClientCommonName {
		t.Errorf("client common name %q", cli.Subject.CommonName)
	}
	client := []x509.ExtKeyUsage{x509.ExtKeyUsageClientAuth}
	if _, err := cli.Verify(x509.VerifyOptions{Roots: pool, KeyUsages: client}); err != nil {
		t.Errorf("client certificate: %v", err)
	}
	if _, err := cli.Verify(x509.VerifyOptions{Roots: otherPool, KeyUsages: client}); err == nil {
		t.Error("client certificate verified against another CA")
	}
	for _, f := range []string{p.ServerKeyFile, p.ClientKeyFile} {
		if st, err := os.Stat(f); err != nil || st.Mode().Perm()&0o077 != 0 {
			t.Errorf("private key %s readable by others (%v)", f, err)
		}
	}
	files, err := p.BrokerFiles()
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{BrokerCAName, BrokerCertName, BrokerKeyName} {
		if len(files[name]) == 0 {
			t.Errorf("BrokerFiles lacks %s", name)
		}
	}
}
