//! The boundary of the printable ink domain, sampled as grids of CMYK values.

use super::Px4;

/// The eight 3-faces of the ink domain {0 ≤ C, M, Y, K ≤ 100, C+M+Y+K ≤ T}
/// where one ink is 0 or 100 %, plus the face C+M+Y+K = T when T < 400, each
/// as an (n+1)³ grid of CMYK values (percent), index (i·(n+1) + j)·(n+1) + k.
/// Grid points beyond the limit are pulled onto it (the free inks scaled
/// down together), so every point is a valid ink combination on the domain's
/// boundary and every boundary point is covered.
pub fn ink_domain_faces(limit: f64, n: usize) -> Vec<Vec<Px4>> {
    let m = n + 1;
    let step = 100.0 / n as f64;
    let mut faces = Vec::new();
    for fixed_ink in 0..4 {
        for fixed in [0.0, 100.0] {
            if fixed > limit {
                continue;
            }
            let mut face = Vec::with_capacity(m * m * m);
            for i in 0..m {
                for j in 0..m {
                    for k in 0..m {
                        let mut free = [i as f64 * step, j as f64 * step, k as f64 * step];
                        let s: f64 = free.iter().sum();
                        if fixed + s > limit && s > 0.0 {
                            let scale = (limit - fixed) / s;
                            free = free.map(|v| v * scale);
                        }
                        let mut c = [0.0; 4];
                        let mut f = free.iter();
                        for (ink, v) in c.iter_mut().enumerate() {
                            *v = if ink == fixed_ink {
                                fixed
                            } else {
                                *f.next().unwrap_or(&0.0)
                            };
                        }
                        face.push(c);
                    }
                }
            }
            faces.push(face);
        }
    }
    if limit < 400.0 {
        let mut face = Vec::with_capacity(m * m * m);
        for i in 0..m {
            for j in 0..m {
                for k in 0..m {
                    let mut cmy = [i as f64 * step, j as f64 * step, k as f64 * step];
                    let s: f64 = cmy.iter().sum();
                    let mut black = limit - s;
                    if black > 100.0 {
                        black = 100.0;
                    } else if black < 0.0 {
                        cmy = cmy.map(|v| v * limit / s);
                        black = 0.0;
                    }
                    face.push([cmy[0], cmy[1], cmy[2], black]);
                }
            }
        }
        faces.push(face);
    }
    faces
}
