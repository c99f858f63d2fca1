#!/usr/bin/python3
"""Write a feature dump the way an outside training pipeline might, for the convention
finder's independence tests (tests/compare/test-explain.c).

Run with Debian's /usr/bin/python3 (numpy; scipy.fft for the DCT when present):

    /usr/bin/python3 tests/compare/make_dump.py CLIP.wav OUT.npy --stage mfcc \
        --spectrum magnitude --mel-scale htk --lifter 22 ...

This script is written from textbook definitions with numpy's own building blocks
(numpy.hanning for the window, numpy.fft.rfft, scipy.fft.dct); it shares no code with
Framewise. Conventions it can vary: power or magnitude spectrum, HTK or Slaney mel scale,
area-normalised or unit-peak triangles, dB reference 1.0 or the clip maximum, orthonormal or
unnormalised DCT-II, sinusoidal liftering, centred (zero-padded) or uncentred frames, periodic
or symmetric Hann window, FFT size and hop. Output: float32 or float64, C or Fortran order,
frames x bins or bins x frames.
"""
import argparse
import struct
import sys

import numpy as np


def read_wav(path):
    """Mono float64 samples and the rate from a RIFF/WAVE file (PCM 16/24/32 or IEEE float)."""
    with open(path, "rb") as f:
        blob = f.read()
    if blob[:4] != b"RIFF" or blob[8:12] != b"WAVE":
        raise SystemExit("%s: not a RIFF/WAVE file" % path)
    pos, fmt, data = 12, None, None
    while pos + 8 <= len(blob):
        cid, size = blob[pos:pos + 4], struct.unpack("<I", blob[pos + 4:pos + 8])[0]
        body = blob[pos + 8:pos + 8 + size]
        if cid == b"fmt ":
            fmt = body
        elif cid == b"data":
            data = body
        pos += 8 + size + (size & 1)
    if fmt is None or data is None:
        raise SystemExit("%s: no fmt or data chunk" % path)
    tag, channels, rate = struct.unpack("<HHI", fmt[:8])
    bits = struct.unpack("<H", fmt[14:16])[0]
    if tag == 0xFFFE:  # WAVE_FORMAT_EXTENSIBLE: the sub-format GUID starts with the tag
        tag = struct.unpack("<H", fmt[24:26])[0]
    if tag == 3 and bits == 32:
        x = np.frombuffer(data, dtype="<f4").astype(np.float64)
    elif tag == 3 and bits == 64:
        x = np.frombuffer(data, dtype="<f8").astype(np.float64)
    elif tag == 1 and bits == 16:
        x = np.frombuffer(data, dtype="<i2") / 32768.0
    elif tag == 1 and bits == 32:
        x = np.frombuffer(data, dtype="<i4") / 2147483648.0
    elif tag == 1 and bits == 24:
        b = np.frombuffer(data, dtype=np.uint8).reshape(-1, 3).astype(np.int32)
        v = b[:, 0] | (b[:, 1] << 8) | (b[:, 2] << 16)
        v = np.where(v >= 1 << 23, v - (1 << 24), v)
        x = v / 8388608.0
    else:
        raise SystemExit("%s: unsupported WAV encoding (tag %d, %d bits)" % (path, tag, bits))
    x = x[: (len(x) // channels) * channels].reshape(-1, channels).mean(axis=1)
    return x, rate


def hz_to_mel(f, scale):
    f = np.asarray(f, dtype=np.float64)
    if scale == "htk":
        return 2595.0 * np.log10(1.0 + f / 700.0)
    # Slaney's Auditory Toolbox: 200/3 Hz per mel up to 1000 Hz, then ratio 6.4 per 27 mels
    lin = f / (200.0 / 3.0)
    log = 15.0 + np.log(np.maximum(f, 1e-300) / 1000.0) / (np.log(6.4) / 27.0)
    return np.where(f < 1000.0, lin, log)


def mel_to_hz(m, scale):
    m = np.asarray(m, dtype=np.float64)
    if scale == "htk":
        return 700.0 * (10.0 ** (m / 2595.0) - 1.0)
    lin = m * (200.0 / 3.0)
    log = 1000.0 * np.exp((m - 15.0) * (np.log(6.4) / 27.0))
    return np.where(m < 15.0, lin, log)


def triangles(rate, n_fft, n_mels, fmin, fmax, scale, weights):
    edges = mel_to_hz(np.linspace(hz_to_mel(fmin, scale), hz_to_mel(fmax, scale), n_mels + 2),
                      scale)
    freqs = np.fft.rfftfreq(n_fft, d=1.0 / rate)
    bank = np.zeros((n_mels, freqs.size))
    for m in range(n_mels):
        lo, mid, hi = edges[m], edges[m + 1], edges[m + 2]
        up = (freqs - lo) / (mid - lo)
        down = (hi - freqs) / (hi - mid)
        bank[m] = np.maximum(0.0, np.minimum(up, down))
        if weights == "area":
            bank[m] *= 2.0 / (hi - lo)
    return bank


def to_db(s, power, reference, floor=1e-10):
    ref = s.max() if reference == "max" else float(reference)
    k = 10.0 if power else 20.0
    return k * np.log10(np.maximum(s, floor)) - k * np.log10(max(ref, floor))


def dct2(x, norm):
    try:
        from scipy.fft import dct
        return dct(x, type=2, norm="ortho" if norm == "ortho" else None, axis=-1)
    except ImportError:  # the DCT-II written out: y_k = 2 sum_n x_n cos(pi k (2n + 1) / 2N)
        n = x.shape[-1]
        k = np.arange(n)[:, None]
        basis = 2.0 * np.cos(np.pi * k * (2 * np.arange(n)[None, :] + 1) / (2 * n))
        y = x @ basis.T
        if norm == "ortho":
            y[..., 0] *= np.sqrt(1.0 / (4 * n))
            y[..., 1:] *= np.sqrt(1.0 / (2 * n))
        return y


def features(x, rate, a):
    n_fft, hop = a.n_fft, a.hop
    if a.centered == "true":
        x = np.pad(x, (n_fft // 2, n_fft // 2), mode="constant")
    count = 1 + (len(x) - n_fft) // hop
    frames = np.stack([x[t * hop:t * hop + n_fft] for t in range(count)])
    # numpy.hanning(N) is the symmetric Hann window; the periodic one is the first N of N + 1
    win = np.hanning(n_fft) if a.window_symmetry == "symmetric" else np.hanning(n_fft + 1)[:-1]
    spec = np.abs(np.fft.rfft(frames * win, axis=1))
    power = a.spectrum == "power"
    if power:
        spec = spec ** 2
    if a.stage in ("power", "magnitude"):
        return spec
    if a.stage == "db":
        return to_db(spec, power, a.db_reference)
    fmax = a.fmax if a.fmax > 0 else rate / 2.0
    mel = spec @ triangles(rate, n_fft, a.n_mels, a.fmin, fmax, a.mel_scale, a.mel_weights).T
    if a.stage == "mel":
        return mel
    mel_db = to_db(mel, power, a.db_reference)
    if a.stage == "mel-db":
        return mel_db
    c = dct2(mel_db, a.dct_norm)[:, :a.n_mfcc]
    if a.lifter > 0:
        n = np.arange(c.shape[1])
        c = c * (1.0 + (a.lifter / 2.0) * np.sin(np.pi * n / a.lifter))
    return c


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    p.add_argument("clip")
    p.add_argument("out")
    p.add_argument("--stage", default="mfcc",
                   choices=["power", "magnitude", "db", "mel", "mel-db", "mfcc"])
    p.add_argument("--spectrum", default="power", choices=["power", "magnitude"])
    p.add_argument("--mel-scale", default="slaney", choices=["htk", "slaney"])
    p.add_argument("--mel-weights", default="area", choices=["area", "unit"])
    p.add_argument("--db-reference", default="1.0")
    p.add_argument("--dct-norm", default="ortho", choices=["ortho", "none"])
    p.add_argument("--centered", default="true", choices=["true", "false"])
    p.add_argument("--window-symmetry", default="periodic", choices=["periodic", "symmetric"])
    p.add_argument("--lifter", type=float, default=0.0)
    p.add_argument("--n-fft", type=int, default=2048)
    p.add_argument("--hop", type=int, default=512)
    p.add_argument("--n-mels", type=int, default=128)
    p.add_argument("--n-mfcc", type=int, default=13)
    p.add_argument("--fmin", type=float, default=0.0)
    p.add_argument("--fmax", type=float, default=0.0)
    p.add_argument("--dtype", default="f4", choices=["f4", "f8"])
    p.add_argument("--order", default="C", choices=["C", "F"])
    p.add_argument("--layout", default="frames-bins", choices=["frames-bins", "bins-frames"])
    a = p.parse_args()
    if a.stage in ("power", "magnitude"):
        a.spectrum = a.stage
    x, rate = read_wav(a.clip)
    y = features(x, rate, a)
    if a.layout == "bins-frames":
        y = y.T
    np.save(a.out, np.array(y, dtype="<" + a.dtype, order=a.order))
    return 0


if __name__ == "__main__":
    sys.exit(main())
