"""A throwaway signing certificate for the tests (never a real engineer's)."""

import datetime


def make_test_certificate(folder, common_name: str, password: bytes = b"pw-test"):
    """A self-signed EC P-256 certificate, as PKCS#12 (with ``password``) and PEM; returns (p12, pem, cert)."""
    from cryptography import x509
    from cryptography.hazmat.primitives import hashes, serialization
    from cryptography.hazmat.primitives.asymmetric import ec
    from cryptography.hazmat.primitives.serialization import pkcs12
    from cryptography.x509.oid import NameOID

    key = ec.generate_private_key(ec.SECP256R1())
    name = x509.Name([x509.NameAttribute(NameOID.COMMON_NAME, common_name)])
    now = datetime.datetime.now(datetime.timezone.utc)
    cert = (x509.CertificateBuilder().subject_name(name).issuer_name(name).public_key(key.public_key())
            .serial_number(x509.random_serial_number()).not_valid_before(now - datetime.timedelta(days=1))
            .not_valid_after(now + datetime.timedelta(days=30))
            .add_extension(x509.KeyUsage(digital_signature=True, content_commitment=True, key_encipherment=False,
                                         data_encipherment=False, key_agreement=False, key_cert_sign=False,
                                         crl_sign=False, encipher_only=False, decipher_only=False), critical=True)
            .sign(key, hashes.SHA256()))
    p12 = folder / "engineer.p12"
    p12.write_bytes(pkcs12.serialize_key_and_certificates(b"engineer", key, cert, None,
                                                          serialization.BestAvailableEncryption(password)))
    pem = folder / "engineer.pem"
    pem.write_bytes(cert.public_bytes(serialization.Encoding.PEM))
    return p12, pem, cert
