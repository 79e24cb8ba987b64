//! The order a screening shows its rows in: best headroom first, equal headrooms by solute
//! name, then in catalog order. A screening may rank 100,000 rows, so the headrooms are
//! turned into integers that order as the numbers do ([`descending`]) and the rows'
//! positions are spread over buckets by their headrooms' values, one pass for most of them
//! ([`spread`]), rather than compared with each other.

/// The headroom's bits turned so that the integers order as `f64::total_cmp` orders the
/// numbers, reversed (best first).
pub fn descending(x: f64) -> u64 {
    let bits = x.to_bits();
    let ascending = if bits >> 63 == 1 {
        !bits
    } else {
        bits | (1 << 63)
    };
    !ascending
}

/// The headroom a key of [`descending`] was made from.
fn headroom_of(key: u64) -> f64 {
    let ascending = !key;
    f64::from_bits(if ascending >> 63 == 1 {
        ascending & !(1 << 63)
    } else {
        !ascending
    })
}

/// The keys of the infinite headrooms: those of finite ones lie strictly between them.
const KEY_OF_INFINITY: u64 = 0x000F_FFFF_FFFF_FFFF;
const KEY_OF_MINUS_INFINITY: u64 = 0xFFF0_0000_0000_0000;

/// The positions `0..keys.len()` in the order shown: by key (`keys[p]` is row `p`'s
/// headroom as [`descending`] makes it), equal keys by `name(p)`, then by position.
pub fn ranked<'a>(keys: &[u64], name: impl Fn(u32) -> &'a str) -> Vec<u32> {
    let n = u32::try_from(keys.len()).unwrap_or(u32::MAX);
    let key = |p: u32| keys.get(p as usize).copied().unwrap_or(u64::MAX);
    // Whether two rows may share a headroom: then they are put in order by name below.
    let mut equal_keys = true;
    let mut order: Vec<u32> = if keys.len() < SPREAD_FROM {
        // Each key with its position below it: one integer that sorts as the pair.
        let mut pairs: Vec<u128> = keys
            .iter()
            .zip(0..n)
            .map(|(&key, p)| u128::from(key) << 32 | u128::from(p))
            .collect();
        pairs.sort_unstable();
        pairs.into_iter().map(|pair| pair as u32).collect()
    } else {
        // The positions spread straight from the keys, in order (no list of them made
        // first). Every position then lies within its bucket, and a bucket holds at most
        // `SMALL` positions not yet in order: one pass of insertion puts them in order,
        // and sees every pair of neighbours with the same key.
        let mut order = vec![0; keys.len()];
        spread_into(keys, keys.iter().copied().zip(0..n), &mut order, 0);
        equal_keys = insert_in_order(&mut order, key);
        order
    };
    // Equal headrooms (rare, but every solute that freezes) by name, then position, as a
    // stable sort by (headroom, name) would leave them.
    if equal_keys {
        let mut start = 0;
        let mut first = order.first().map(|&p| key(p));
        for i in 1..=order.len() {
            let here = order.get(i).map(|&p| key(p));
            if here != first {
                if i - start > 1 {
                    order[start..i].sort_by(|&a, &b| name(a).cmp(name(b)).then(a.cmp(&b)));
                }
                (start, first) = (i, here);
            }
        }
    }
    order
}

/// Sorts `positions` by (key, position) by insertion: quick where each is at most a few
/// places from its own. Says whether two of them share a key.
fn insert_in_order(positions: &mut [u32], key: impl Fn(u32) -> u64) -> bool {
    let mut equal_keys = false;
    let Some(&first) = positions.first() else {
        return false;
    };
    // The last of the positions in order so far (the greatest), with its key: most
    // positions come after it and are compared with it alone.
    let mut last = (key(first), first);
    for i in 1..positions.len() {
        let p = positions[i];
        let here = (key(p), p);
        equal_keys |= last.0 == here.0;
        if last < here {
            last = here;
            continue;
        }
        positions[i] = last.1;
        let mut j = i - 1;
        while j > 0 {
            let q = positions[j - 1];
            let kq = key(q);
            equal_keys |= kq == here.0;
            if (kq, q) < here {
                break;
            }
            positions[j] = q;
            j -= 1;
        }
        positions[j] = p;
    }
    equal_keys
}

/// From how many rows [`ranked`] spreads them over buckets rather than sorting them by
/// comparison.
const SPREAD_FROM: usize = 1024;

/// Up to how many positions a bucket of [`spread_into`] may hold without being spread again
/// (its positions are put in order by [`insert_in_order`]).
const SMALL: usize = 32;

/// How many times a bucket is spread again before it is sorted by comparison (headrooms
/// spread far apart, say by powers of ten, would otherwise peel off a few rows a spread).
const DEEPEST: u32 = 6;

/// [`spread_into`] of `positions`, in place: a crowded bucket spread again.
fn spread(keys: &[u64], positions: &mut [u32], depth: u32) {
    let from = positions.to_vec();
    let key = |p: u32| keys.get(p as usize).copied().unwrap_or(u64::MAX);
    spread_into(keys, from.iter().map(|&p| (key(p), p)), positions, depth);
}

/// Puts the positions of `from` (each with its key; as many as `into` holds) into `into` by
/// bucket of their keys. Each position of a finite headroom goes to one of as many buckets
/// as there are positions, in proportion to where its headroom lies between the highest
/// and the lowest (a bucket's index never falls as the key rises); the others (infinite,
/// not a number) to a bucket at either end. A bucket of more than `SMALL` positions is spread the
/// same way in turn, or sorted by key and position once `DEEPEST` deep; smaller ones are
/// left in the order they came.
fn spread_into(
    keys: &[u64],
    from: impl Iterator<Item = (u64, u32)> + Clone,
    into: &mut [u32],
    depth: u32,
) {
    let key = |p: u32| keys.get(p as usize).copied().unwrap_or(u64::MAX);
    let m = into.len();
    let in_order = |into: &mut [u32]| {
        for (slot, (_, p)) in into.iter_mut().zip(from.clone()) {
            *slot = p;
        }
    };
    if m <= SMALL {
        in_order(into);
        return;
    }
    // The lowest and highest keys of finite headrooms (the highest and lowest headrooms).
    let (mut lo, mut hi) = (u64::MAX, 0);
    for (k, _) in from.clone() {
        let finite = k > KEY_OF_INFINITY && k < KEY_OF_MINUS_INFINITY;
        lo = lo.min(if finite { k } else { u64::MAX });
        hi = hi.max(if finite { k } else { 0 });
    }
    let (top, bottom) = (headroom_of(lo), headroom_of(hi));
    let span = top - bottom;
    // The last bucket of a finite headroom's and the one after it.
    let edges = u32::try_from(m - 1).ok().zip(u32::try_from(m + 1).ok());
    let Some((last, beyond)) =
        edges.filter(|_| depth < DEEPEST && lo <= hi && span.is_finite() && span > 0.0)
    else {
        // Deep enough, or no two finite headrooms differ (or their span overflows): by
        // comparison, which is quick on positions already in order.
        in_order(into);
        into.sort_unstable_by_key(|&p| (key(p), p));
        return;
    };
    let scale = m as f64 / span;
    // Keys from `lo` to `hi` are those of finite headrooms; the difference from the top and
    // the product never fall as the key rises (the headroom falls), nor does their cut.
    let bucket = |k: u64| {
        if k < lo {
            0
        } else if k > hi {
            beyond
        } else {
            1 + (((top - headroom_of(k)) * scale) as u32).min(last)
        }
    };
    // Each position's bucket, worked out once; then where each bucket starts.
    let mut ends = vec![0u32; m + 3];
    let buckets: Vec<u32> = from
        .clone()
        .map(|(k, _)| {
            let b = bucket(k);
            if let Some(count) = ends.get_mut(b as usize + 1) {
                *count += 1;
            }
            b
        })
        .collect();
    for i in 1..ends.len() {
        ends[i] += ends[i - 1];
    }
    // Each bucket's start moves on as it is filled, to end where the bucket ends.
    for ((_, p), &b) in from.zip(&buckets) {
        if let Some(next) = ends.get_mut(b as usize) {
            if let Some(slot) = into.get_mut(*next as usize) {
                *slot = p;
            }
            *next += 1;
        }
    }
    let mut start = 0;
    for &end in &ends[..m + 2] {
        let end = end as usize;
        if end - start > SMALL {
            spread(keys, &mut into[start..end], depth + 1);
        }
        start = end;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A small deterministic generator for invented headrooms.
    fn xorshift(mut state: u64) -> impl FnMut() -> u64 {
        move || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            state
        }
    }

    #[test]
    fn the_positions_come_in_the_order_of_a_full_sort_by_key_and_position() {
        // Invented headrooms: spread, crowded, repeated, signed zeros, infinities, NaN, a
        // span that overflows, powers of ten; each ordered by value and against a sort of
        // the (key, position) pairs.
        let mut next = xorshift(0x9E37_79B9_7F4A_7C15);
        let mut lists: Vec<Vec<f64>> = Vec::new();
        lists.push(
            (0..5_000)
                .map(|_| (next() % 48_000) as f64 / 100.0 - 98.0)
                .collect(),
        );
        lists.push(
            (0..5_000)
                .map(|_| 1.0 + (next() % 7) as f64 * 1e-12)
                .collect(),
        );
        let mut mixed: Vec<f64> = (0..4_000)
            .map(|_| (next() % 1_000) as f64 - 500.0)
            .collect();
        mixed.extend([
            f64::INFINITY,
            f64::NEG_INFINITY,
            f64::NAN,
            -f64::NAN,
            0.0,
            -0.0,
        ]);
        mixed.extend([1e300, -1e300, 1e-300, f64::MAX, f64::MIN]);
        lists.push(mixed.clone());
        mixed.retain(|x| x.abs() < 1e299);
        lists.push(mixed);
        lists.push(vec![7.0; 3_000]);
        let mut crowd: Vec<f64> = (0..3_000).map(|_| (next() % 3) as f64).collect();
        crowd.push(1e6);
        lists.push(crowd);
        lists.push((0..3_000).map(|i| 10f64.powi(i % 600 - 300)).collect());
        lists.push(vec![f64::NEG_INFINITY; 100]);
        lists.push(vec![]);
        for headrooms in lists {
            let keys: Vec<u64> = headrooms.iter().map(|&h| descending(h)).collect();
            let order = ranked(&keys, |_| "");
            let mut want: Vec<(u64, u32)> = keys.iter().copied().zip(0u32..).collect();
            want.sort_unstable();
            let want: Vec<u32> = want.into_iter().map(|(_, p)| p).collect();
            assert_eq!(order, want, "{:?}", headrooms.get(..3));
            // The buckets alone leave no position more than `SMALL` places after one that
            // comes later in the order, so the pass of insertion stays short (a bucket
            // index that falls as the key rises breaks this).
            let mut spread_only: Vec<u32> = (0..want.len() as u32).collect();
            spread(&keys, &mut spread_only, 0);
            let pair = |p: u32| (keys[p as usize], p);
            let mut highest_before = None;
            for i in SMALL..spread_only.len() {
                highest_before = highest_before.max(Some(pair(spread_only[i - SMALL])));
                assert!(highest_before <= Some(pair(spread_only[i])), "{i}");
            }
        }
    }

    #[test]
    fn equal_headrooms_come_by_name_then_position() {
        let keys: Vec<u64> = [2.0, 5.0, 2.0, 2.0, f64::NEG_INFINITY, f64::NEG_INFINITY]
            .iter()
            .map(|&h| descending(h))
            .collect();
        let names = ["b", "x", "a", "b", "d", "c"];
        let order = ranked(&keys, |p| names[p as usize]);
        assert_eq!(order, [1, 2, 0, 3, 5, 4]);
        // The same among as many rows as are spread over buckets: a few equal headrooms
        // (each shared by two rows) among distinct ones, names falling as positions rise;
        // and one shared headroom alone, between neighbours already in order.
        let few_shared: Vec<f64> = (0..3_000)
            .map(|i| {
                if i % 500 < 2 {
                    7.5 + (i / 500) as f64
                } else {
                    i as f64 * 0.37
                }
            })
            .collect();
        let one_shared: Vec<f64> = (0..3_000)
            .map(|i| if i == 1_001 { -1_000.0 } else { -(i as f64) })
            .collect();
        for headrooms in [few_shared, one_shared] {
            let keys: Vec<u64> = headrooms.iter().map(|&h| descending(h)).collect();
            let names: Vec<String> = (0..3_000).map(|i| format!("{:04}", 3_000 - i)).collect();
            let order = ranked(&keys, |p| names[p as usize].as_str());
            let mut want: Vec<u32> = (0..3_000).collect();
            want.sort_by(|&a, &b| {
                keys[a as usize]
                    .cmp(&keys[b as usize])
                    .then(names[a as usize].cmp(&names[b as usize]))
            });
            assert_eq!(order, want);
            assert!(
                order
                    .windows(2)
                    .any(|w| keys[w[0] as usize] == keys[w[1] as usize] && w[0] > w[1])
            );
        }
    }

    #[test]
    fn the_integer_keys_order_as_the_headrooms_reversed() {
        let values = [
            f64::NEG_INFINITY,
            -1e300,
            -12.5,
            -0.0,
            0.0,
            1e-300,
            3.0,
            12.5,
            f64::INFINITY,
        ];
        for a in values {
            for b in values {
                assert_eq!(
                    descending(a).cmp(&descending(b)),
                    b.total_cmp(&a),
                    "{a} {b}"
                );
            }
            assert_eq!(headroom_of(descending(a)).to_bits(), a.to_bits());
        }
        assert_eq!(descending(f64::INFINITY), KEY_OF_INFINITY);
        assert_eq!(descending(f64::NEG_INFINITY), KEY_OF_MINUS_INFINITY);
    }
}
