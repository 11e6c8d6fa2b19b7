package brokertest

import (
	"crypto/ecdsa"
	"crypto/elliptic"
	"crypto/rand"
	"crypto/x509"
	"crypto/x509/pkix"
	"encoding/pem"
	"fmt"
	"math/big"
	"net"
	"os"
	"path/filepath"
	"time"
)

// PKI is a throwaway certificate authority with one server certificate
// (for 127.0.0.1 and localhost) and one client certificate, written as
// PEM files. Tests of TLS to the broker need both sides signed by a CA
// they control; a second PKI gives a CA that signed nothing the broker
// shows, for the refusal cases.
type PKI struct {
	// Dir holds the files below.
	Dir string
	// CAFile is the CA certificate: what framed's mqtt.ca_file names and
	// what the broker's cafile names to check client certificates.
	CAFile string
	// ServerCertFile and ServerKeyFile are the broker's certificate and key.
	ServerCertFile, ServerKeyFile string
	// ClientCertFile and ClientKeyFile are a client certificate and key
	// (common name ClientCommonName).
	ClientCertFile, ClientKeyFile string
}

// ClientCommonName is the common name of the client certificate that
// WriteTestPKI makes.
const ClientCommonName = "framed-test-client"

// Broker file names as the TLS config templates in testdata/mosquitto
// expect them in {{.Dir}}.
const (
	BrokerCAName   = "ca.pem"
	BrokerCertName = "server.pem"
	BrokerKeyName  = "server.key"
)

// WriteTestPKI makes a fresh CA (valid from an hour ago for a day), signs
// a server and a client certificate with it, and writes them into dir:
// ca.pem, server.pem, server.key, client.pem, client.key. Keys are ECDSA
// P-256 in PKCS #8, which both Go and Mosquitto's OpenSSL read. Private
// keys are written 0600.
func WriteTestPKI(dir string) (PKI, error) {
	p := PKI{
		Dir:            dir,
		CAFile:         filepath.Join(dir, "ca.pem"),
		ServerCertFile: filepath.Join(dir, "server.pem"),
		ServerKeyFile:  filepath.Join(dir, "server.key"),
		ClientCertFile: filepath.Join(dir, "client.pem"),
		ClientKeyFile:  filepath.Join(dir, "client.key"),
	}
	now := time.Now()
	caKey, err := ecdsa.GenerateKey(elliptic.P256(), rand.Reader)
	if err != nil {
		return PKI{}, fmt.Errorf("test PKI: CA key: %w", err)
	}
	caTmpl := &x509.Certificate{
		SerialNumber:          serial(),
		Subject:               pkix.Name{CommonName: "framed test CA", Organization: []string{"framed tests"}},
		NotBefore:             now.Add(-time.Hour),
		NotAfter:              now.Add(24 * time.Hour),
		IsCA:                  true,
		BasicConstraintsValid: true,
		KeyUsage:              x509.KeyUsageCertSign | x509.KeyUsageCRLSign,
	}
	caDER, err := x509.CreateCertificate(rand.Reader, caTmpl, caTmpl, &caKey.PublicKey, caKey)
	if err != nil {
		return PKI{}, fmt.Errorf("test PKI: CA certificate: %w", err)
	}
	ca, err := x509.ParseCertificate(caDER)
	if err != nil {
		return PKI{}, fmt.Errorf("test PKI: CA certificate: %w", err)
	}
	if err := writePEM(p.CAFile, "CERTIFICATE", caDER, 0o644); err != nil {
		return PKI{}, err
	}

	leaves := []struct {
		tmpl              *x509.Certificate
		certFile, keyFile string
	}{
		{&x509.Certificate{
			Subject:     pkix.Name{CommonName: "127.0.0.1"},
			IPAddresses: []net.IP{net.IPv4(127, 0, 0, 1), net.IPv6loopback},
			DNSNames:    []string{"localhost"},
			ExtKeyUsage: []x509.ExtKeyUsage{x509.ExtKeyUsageServerAuth},
		}, p.ServerCertFile, p.ServerKeyFile},
		{&x509.Certificate{
			Subject:     pkix.Name{CommonName: ClientCommonName},
			ExtKeyUsage: []x509.ExtKeyUsage{x509.ExtKeyUsageClientAuth},
		}, p.ClientCertFile, p.ClientKeyFile},
	}
	for _, l := range leaves {
		key, err := ecdsa.GenerateKey(elliptic.P256(), rand.Reader)
		if err != nil {
			return PKI{}, fmt.Errorf("test PKI: key: %w", err)
		}
		l.tmpl.SerialNumber = serial()
		l.tmpl.NotBefore = now.Add(-time.Hour)
		l.tmpl.NotAfter = now.Add(24 * time.Hour)
		l.tmpl.KeyUsage = x509.KeyUsageDigitalSignature
		der, err := x509.CreateCertificate(rand.Reader, l.tmpl, ca, &key.PublicKey, caKey)
		if err != nil {
			return PKI{}, fmt.Errorf("test PKI: certificate %s: %w", l.tmpl.Subject.CommonName, err)
		}
		keyDER, err := x509.MarshalPKCS8PrivateKey(key)
		if err != nil {
			return PKI{}, fmt.Errorf("test PKI: key: %w", err)
		}
		if err := writePEM(l.certFile, "CERTIFICATE", der, 0o644); err != nil {
			return PKI{}, err
		}
		if err := writePEM(l.keyFile, "PRIVATE KEY", keyDER, 0o600); err != nil {
			return PKI{}, err
		}
	}
	return p, nil
}

// BrokerFiles reads the CA, server certificate and server key back for
// Options.Files, under the names the TLS templates expect.
func (p PKI) BrokerFiles() (map[string][]byte, error) {
	files := map[string][]byte{}
	for name, path := range map[string]string{
		BrokerCAName: p.CAFile, BrokerCertName: p.ServerCertFile, BrokerKeyName: p.ServerKeyFile,
	} {
		b, err := os.ReadFile(path)
		if err != nil {
			return nil, fmt.Errorf("test PKI: %w", err)
		}
		files[name] = b
	}
	return files, nil
}

// serial is a random 128-bit serial number: certificates from separate
// test CAs never share one.
func serial() *big.Int {
	n, err := rand.Int(rand.Reader, new(big.Int).Lsh(big.NewInt(1), 128))
	if err != nil {
		return big.NewInt(time.Now().UnixNano())
	}
	return n
}

func writePEM(path, kind string, der []byte, perm os.FileMode) error {
	b := pem.EncodeToMemory(&pem.Block{Type: kind, Bytes: der})
	if err := os.WriteFile(path, b, perm); err != nil {
		return fmt.Errorf("test PKI: %w", err)
	}
	return nil
}
