#!/usr/bin/python3
"""The Framewise MFCC chain written directly with numpy/scipy, for the benchmark.

Usage: bench_mfcc_numpy.py SAMPLES.f32 SAMPLE_RATE OUT.f32 [REPEAT]

Reads raw little-endian float32 samples, computes the chain with the conventions of issue 2
(centred, zero padding of n_fft/2, periodic Hann 2048, hop 512, power spectrum, 128 Slaney
area-normalised mel bands 0..sr/2, 10 log10 with floor 1e-10 re 1.0, orthonormal DCT-II,
13 coefficients, no lifter), and prints one line "seconds=<best wall time> cpu=<best CPU time
of the process, all threads> frames=<n>".
The MFCC matrix is written to OUT.f32 so the caller can compare. Frames are processed in
blocks so the working set stays small (a fair, not a naive, numpy implementation).
"""
import sys
import time

import numpy as np
import scipy.fft

N_FFT = 2048
HOP = 512
N_MELS = 128
N_MFCC = 13
FLOOR = 1e-10
BLOCK = 2048  # frames per block


def slaney_hz_to_mel(f):
    f = np.asarray(f, dtype=np.float64)
    return np.where(f < 1000.0, 3.0 * f / 200.0,
                    15.0 + 27.0 * np.log(np.maximum(f, 1e-300) / 1000.0) / np.log(6.4))


def slaney_mel_to_hz(m):
    m = np.asarray(m, dtype=np.float64)
    return np.where(m < 15.0, 200.0 * m / 3.0, 1000.0 * np.exp((m - 15.0) * np.log(6.4) / 27.0))


def mel_bank(sr):
    fmax = sr / 2.0
    mels = np.linspace(slaney_hz_to_mel(0.0), slaney_hz_to_mel(fmax), N_MELS + 2)
    edges = slaney_mel_to_hz(mels)
    edges[0], edges[-1] = 0.0, fmax
    freqs = np.arange(N_FFT // 2 + 1) * sr / N_FFT
    lo, mid, hi = edges[:-2, None], edges[1:-1, None], edges[2:, None]
    up = (freqs[None, :] - lo) / (mid - lo)
    down = (hi - freqs[None, :]) / (hi - mid)
    w = np.maximum(0.0, np.minimum(up, down))
    w *= (2.0 / (hi - lo))
    return w.astype(np.float32)


def mfcc(x, sr):
    n = np.arange(N_FFT)
    window = (0.5 - 0.5 * np.cos(2.0 * np.pi * n / N_FFT)).astype(np.float32)
    bank_t = np.ascontiguousarray(mel_bank(sr).T)
    pad = N_FFT // 2
    xp = np.pad(x, (pad, pad), mode="constant")
    frames = np.lib.stride_tricks.sliding_window_view(xp, N_FFT)[::HOP]
    n_frames = frames.shape[0]
    mel = np.empty((n_frames, N_MELS), dtype=np.float32)
    for start in range(0, n_frames, BLOCK):
        block = frames[start:start + BLOCK] * window
        spec = scipy.fft.rfft(block, axis=-1)
        power = spec.real ** 2 + spec.imag ** 2
        mel[start:start + BLOCK] = power @ bank_t
    db = 10.0 * np.log10(np.maximum(mel, FLOOR))
    return scipy.fft.dct(db, type=2, norm="ortho", axis=-1)[:, :N_MFCC]


def main():
    path, sr, out = sys.argv[1], float(sys.argv[2]), sys.argv[3]
    repeat = int(sys.argv[4]) if len(sys.argv) > 4 else 1
    x = np.fromfile(path, dtype="<f4")
    best = best_cpu = None
    for _ in range(repeat):
        t0, c0 = time.perf_counter(), time.process_time()
        c = mfcc(x, sr)
        dt, dc = time.perf_counter() - t0, time.process_time() - c0
        best = dt if best is None else min(best, dt)
        best_cpu = dc if best_cpu is None else min(best_cpu, dc)
    np.ascontiguousarray(c, dtype="<f4").tofile(out)
    print("seconds=%.6f cpu=%.6f frames=%d" % (best, best_cpu, c.shape[0]))


if __name__ == "__main__":
    main()
