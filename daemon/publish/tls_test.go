package publish

import (
	"crypto/ecdsa"
	"crypto/elliptic"
	"crypto/rand"
	"crypto/tls"
	"crypto/x509"
	"crypto/x509/pkix"
	"encoding/pem"
	"math/big"
	"net"
	"os"
	"path/filepath"
	"testing"
	"time"

	"framed/daemon/publish/brokertest"
)

// testPKI makes a throwaway CA and a server certificate for 127.0.0.1.
func testPKI(t *testing.T) (caPEM, certPEM, keyPEM []byte) {
	t.Helper()
	caKey, err := ecdsa.GenerateKey(elliptic.P256(), rand.Reader)
	if err != nil {
		t.Fatal(err)
	}
	now := time.Now()
	caTmpl := &x509.Certificate{
		SerialNumber: big.NewInt(1), Subject: pkix.Name{CommonName: "framed test CA"},
		NotBefore: now.Add(-time.Hour), NotAfter: now.Add(time.Hour),
		IsCA: true, BasicConstraintsValid: true, KeyUsage: x509.KeyUsageCertSign,
	}
	caDER, err := x509.CreateCertificate(rand.Reader, caTmpl, caTmpl, &caKey.PublicKey, caKey)
	if err != nil {
		t.Fatal(err)
	}
	ca, _ := x509.ParseCertificate(caDER)
	key, err := ecdsa.GenerateKey(elliptic.P256(), rand.Reader)
	if err != nil {
		t.Fatal(err)
	}
	srvTmpl := &x509.Certificate{
		SerialNumber: big.NewInt(2), Subject: pkix.Name{CommonName: "127.0.0.1"},
		NotBefore: now.Add(-time.Hour), NotAfter: now.Add(time.Hour),
		IPAddresses: []net.IP{net.ParseIP("127.0.0.1")},
		KeyUsage:    x509.KeyUsageDigitalSignature, ExtKeyUsage: []x509.ExtKeyUsage{x509.ExtKeyUsageServerAuth},
	}
	srvDER, err := x509.CreateCertificate(rand.Reader, srvTmpl, ca, &key.PublicKey, caKey)
	if err != nil {
		t.Fatal(err)
	}
	keyDER, err := x509.MarshalECPrivateKey(key)
	if err != nil {
		t.Fatal(err)
	}
	return pem.EncodeToMemory(&pem.Block{Type: "CERTIFICATE", Bytes: caDER}),
		pem.EncodeToMemory(&pem.Block{Type: "CERTIFICATE", Bytes: srvDER}),
		pem.EncodeToMemory(&pem.Block{Type: "EC PRIVATE KEY", Bytes: keyDER})
}

// Results over ssl:// with the broker's CA given as a file; a publisher
// trusting another CA never connects and never fails.
func TestTLSDeliveryIntegration(t *testing.T) {
	caPEM, certPEM, keyPEM := testPKI(t)
	broker, _, _ := brokertest.StartMosquittoWith(t, brokertest.Options{
		Template: "tls.conf", Scheme: "ssl",
		Files: map[string][]byte{"ca.pem": caPEM, "server.pem": certPEM, "server.key": keyPEM},
	})
	dir := t.TempDir()
	caFile := filepath.Join(dir, "ca.pem")
	if err := os.WriteFile(caFile, caPEM, 0o600); err != nil {
		t.Fatal(err)
	}
	pool := x509.NewCertPool()
	pool.AppendCertsFromPEM(caPEM)
	sub := subscribe(t, broker, "framed/frame-a/results/#", &tls.Config{RootCAs: pool, MinVersion: tls.VersionTLS12})

	db := openStore(t, dir)
	putResult(t, db, "T-1")
	p, err := New(Config{Broker: broker, Frame: "frame-a", CAFile: caFile, MaxRetryInterval: 200 * time.Millisecond}, db, nil)
	if err != nil {
		t.Fatal(err)
	}
	if err := p.Start(t.Context()); err != nil {
		t.Fatal(err)
	}
	defer p.Close()
	if got := collectResults(t, sub, 1); got[0] != "T-1/1" {
		t.Fatalf("arrived %v", got)
	}

	otherCA, _, _ := testPKI(t)
	wrong := filepath.Join(dir, "other-ca.pem")
	if err := os.WriteFile(wrong, otherCA, 0o600); err != nil {
		t.Fatal(err)
	}
	q, err := New(Config{Broker: broker, Frame: "frame-b", CAFile: wrong, MaxRetryInterval: 100 * time.Millisecond}, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if err := q.Start(t.Context()); err != nil {
		t.Fatal(err)
	}
	defer q.Close()
	for i := 0; i < 50; i++ {
		if q.connected() {
			t.Fatal("connected to a broker whose certificate it should not trust")
		}
		time.Sleep(10 * time.Millisecond)
	}
}
