//! Work on both cores with output in order: `check` evaluates its sheets on worker threads and
//! prints each sheet's report as soon as every sheet before it is printed, so its output is
//! the same as one sheet after another and a report's memory goes once it is printed.

use std::collections::BTreeMap;
use std::io;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::{mpsc, Condvar, Mutex};

/// How many finished results, per worker, may wait for an earlier slow one: bounds the memory
/// held back by a long sheet near the front.
const WAITING_PER_WORKER: usize = 2;

/// Applies `work` to every item on up to one thread per core and hands the results to
/// `consume` in item order. After an error from `consume` no new item is started; the error
/// is returned once the items in progress are done.
pub(crate) fn map_in_order<T, R>(
    items: &[T],
    work: impl Fn(&T) -> R + Sync,
    mut consume: impl FnMut(R) -> io::Result<()>,
) -> io::Result<()>
where
    T: Sync,
    R: Send,
{
    let workers = crate::eval::available_cores().min(items.len());
    if workers <= 1 {
        for item in items {
            consume(work(item))?;
        }
        return Ok(());
    }
    let window = workers * WAITING_PER_WORKER;
    let next = AtomicUsize::new(0);
    // The number of results consumed so far; workers wait on it to stay within the window.
    let consumed = (Mutex::new(0usize), Condvar::new());
    let (sender, receiver) = mpsc::channel::<(usize, R)>();
    std::thread::scope(|scope| {
        for _ in 0..workers {
            let sender = sender.clone();
            let (next, consumed, work) = (&next, &consumed, &work);
            scope.spawn(move || loop {
                let index = next.fetch_add(1, Ordering::Relaxed);
                if index >= items.len() {
                    break;
                }
                {
                    let (count, changed) = consumed;
                    let mut count = count
                        .lock()
                        .unwrap_or_else(|poisoned| poisoned.into_inner());
                    while index >= *count + window {
                        count = changed
                            .wait(count)
                            .unwrap_or_else(|poisoned| poisoned.into_inner());
                    }
                }
                if sender.send((index, work(&items[index]))).is_err() {
                    break;
                }
            });
        }
        drop(sender);
        let mut waiting = BTreeMap::new();
        let mut expected = 0;
        let mut outcome = Ok(());
        for (index, result) in receiver {
            waiting.insert(index, result);
            while let Some(result) = waiting.remove(&expected) {
                expected += 1;
                if outcome.is_ok() {
                    outcome = consume(result);
                    if outcome.is_err() {
                        next.store(items.len(), Ordering::Relaxed);
                    }
                }
                let (count, changed) = &consumed;
                *count
                    .lock()
                    .unwrap_or_else(|poisoned| poisoned.into_inner()) = expected;
                changed.notify_all();
            }
        }
        outcome
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn results_come_in_item_order_whatever_order_they_finish_in() {
        let items: Vec<u64> = (0..40).collect();
        let mut seen = Vec::new();
        map_in_order(
            &items,
            |item| {
                // Early items take longest, so later ones finish first.
                std::thread::sleep(std::time::Duration::from_millis(
                    40u64.saturating_sub(*item),
                ));
                item * 10
            },
            |result| {
                seen.push(result);
                Ok(())
            },
        )
        .expect("no error");
        assert_eq!(seen, (0..40).map(|item| item * 10).collect::<Vec<_>>());
    }

    #[test]
    fn an_error_stops_new_work_and_is_returned() {
        let items: Vec<usize> = (0..1000).collect();
        let started = AtomicUsize::new(0);
        let mut consumed = 0;
        let outcome = map_in_order(
            &items,
            |item| {
                started.fetch_add(1, Ordering::Relaxed);
                *item
            },
            |_| {
                consumed += 1;
                if consumed == 3 {
                    Err(io::Error::other("closed"))
                } else {
                    Ok(())
                }
            },
        );
        assert_eq!(outcome.expect_err("the error").to_string(), "closed");
        assert_eq!(consumed, 3);
        let workers = std::thread::available_parallelism().map_or(1, usize::from);
        if workers > 1 {
            // Within the window of waiting results, never the whole list.
            assert!(started.load(Ordering::Relaxed) <= 3 + workers * (WAITING_PER_WORKER + 1));
        }
    }
}
