import { createHash, createPrivateKey, createPublicKey, generateKeyPairSync, KeyObject, sign, verify } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { treeHeadMessage, type SignedTreeHead, type SigningKey } from './provenance.schema';

/**
 * The log's tree heads are signed with Ed25519 so anyone holding the public key can check that a
 * head (size, root, time) came from this server; consistency proofs then tie the heads together.
 */

export interface TreeHeadSigningKey {
  privateKey: KeyObject;
  publicKey: KeyObject;
  keyId: string;
  publicKeyPem: string;
}

/**
 * The server's signing key from a PKCS#8 PEM file, made (with its directory) on first use. The
 * file is created exclusively with mode 0600, so two processes starting at once keep one key.
 */
export function loadOrCreateSigningKey(path: string): TreeHeadSigningKey {
  try {
    return signingKeyFrom(createPrivateKey(readFileSync(path, 'utf8')));
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
  }
  mkdirSync(dirname(path), { recursive: true, mode: 0o700 });
  const { privateKey } = generateKeyPairSync('ed25519');
  try {
    writeFileSync(path, privateKey.export({ type: 'pkcs8', format: 'pem' }), { mode: 0o600, flag: 'wx' });
  } catch (error) {
    // Another process made it first: use that one.
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') return signingKeyFrom(createPrivateKey(readFileSync(path, 'utf8')));
    throw error;
  }
  return signingKeyFrom(privateKey);
}

function signingKeyFrom(privateKey: KeyObject): TreeHeadSigningKey {
  if (privateKey.asymmetricKeyType !== 'ed25519') throw new Error(`the tree-head signing key must be Ed25519, not ${privateKey.asymmetricKeyType}`);
  const publicKey = createPublicKey(privateKey);
  return { privateKey, publicKey, keyId: keyIdOf(publicKey), publicKeyPem: publicKeyPemOf(publicKey) };
}

/** The first 16 hex digits of SHA-256 over the public key's SPKI DER. */
export function keyIdOf(publicKey: KeyObject): string {
  const der = toPublicKey(publicKey).export({ type: 'spki', format: 'der' });
  return createHash('sha256').update(der).digest('hex').slice(0, 16);
}

/** The SPKI PEM of a key (a private key gives its public half). */
export function publicKeyPemOf(key: KeyObject): string {
  return toPublicKey(key).export({ type: 'spki', format: 'pem' }).toString();
}

/** What the api publishes about its key (GET of the signing key). */
export function signingKeyDescription(key: KeyObject): SigningKey {
  return { keyId: keyIdOf(key), algorithm: 'Ed25519', publicKeyPem: publicKeyPemOf(key) };
}

function toPublicKey(key: KeyObject): KeyObject {
  return key.type === 'private' ? createPublicKey(key) : key;
}

/** `keyId` saves deriving the public key on every head when the caller already knows it. */
export function signTreeHead(
  privateKey: KeyObject,
  head: Pick<SignedTreeHead, 'treeSize' | 'rootHash' | 'timestamp'>,
  keyId: string = keyIdOf(privateKey),
): SignedTreeHead {
  const unsigned = { treeSize: head.treeSize, rootHash: head.rootHash, timestamp: head.timestamp };
  const signature = sign(null, Buffer.from(treeHeadMessage(unsigned), 'utf8'), privateKey).toString('base64');
  return { ...unsigned, keyId, signature };
}

/**
 * Whether `head` was signed by the key in `publicKeyPem`. A head naming another key id is refused
 * too, and so is a signature whose base64 is not exactly what encoding its bytes gives (lenient
 * decoding would let some altered strings through).
 */
export function verifyTreeHead(publicKeyPem: string, head: SignedTreeHead): boolean {
  try {
    const publicKey = createPublicKey(publicKeyPem);
    if (publicKey.asymmetricKeyType !== 'ed25519' || head.keyId !== keyIdOf(publicKey)) return false;
    const signature = Buffer.from(head.signature, 'base64');
    if (signature.length !== 64 || signature.toString('base64') !== head.signature) return false;
    return verify(null, Buffer.from(treeHeadMessage(head), 'utf8'), publicKey, signature);
  } catch {
    return false;
  }
}
