//! Dependency order: which definitions must be evaluated before which, and the cycles that make
//! an order impossible. Kahn's algorithm keeps this linear in the size of the sheet.

use std::collections::HashMap;

/// The result of ordering `count` definitions.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Order {
    /// Definitions that can be evaluated, dependencies first.
    pub sequence: Vec<usize>,
    /// Each cycle found, as definition indices in dependency order (first element repeated
    /// implicitly at the end).
    pub cycles: Vec<Vec<usize>>,
    /// Definitions not in `sequence`: in a cycle or downstream of one.
    pub blocked: Vec<usize>,
}

/// Orders definitions given, for each, the definitions it depends on.
pub fn dependency_order(dependencies: &[Vec<usize>]) -> Order {
    let count = dependencies.len();
    let mut dependents: Vec<Vec<usize>> = vec![Vec::new(); count];
    let mut waiting_on = vec![0usize; count];
    for (node, needs) in dependencies.iter().enumerate() {
        waiting_on[node] = needs.len();
        for &need in needs {
            dependents[need].push(node);
        }
    }
    let mut ready: Vec<usize> = (0..count)
        .rev()
        .filter(|node| waiting_on[*node] == 0)
        .collect();
    let mut sequence = Vec::with_capacity(count);
    while let Some(node) = ready.pop() {
        sequence.push(node);
        for &dependent in &dependents[node] {
            waiting_on[dependent] -= 1;
            if waiting_on[dependent] == 0 {
                ready.push(dependent);
            }
        }
    }
    let blocked: Vec<usize> = (0..count).filter(|node| waiting_on[*node] > 0).collect();
    let cycles = find_cycles(dependencies, &waiting_on, &blocked);
    Order {
        sequence,
        cycles,
        blocked,
    }
}

/// The shortest cycle through `start`, found by walking back from it: `needed_by(node, out)`
/// puts in `out` the nodes that need `node`, and `start_needs(node)` says whether `start` needs
/// `node`. The answer lists the nodes from `start` in dependency order (`start` needs the
/// second, each needs the next, the last needs `start`), `start` not repeated. Node numbers are
/// the caller's own; the walk visits only what depends on `start`, so a caller can ask before
/// adding `start` to its graph (a session's new definition) at the cost of its dependents.
pub fn shortest_cycle_through(
    start: usize,
    mut needed_by: impl FnMut(usize, &mut Vec<usize>),
    start_needs: impl Fn(usize) -> bool,
) -> Option<Vec<usize>> {
    if start_needs(start) {
        return Some(vec![start]);
    }
    let mut reached_from: HashMap<usize, usize> = HashMap::new();
    let mut queue = std::collections::VecDeque::from([start]);
    let mut found = Vec::new();
    while let Some(node) = queue.pop_front() {
        found.clear();
        needed_by(node, &mut found);
        for &dependent in &found {
            if dependent == start || reached_from.contains_key(&dependent) {
                continue;
            }
            reached_from.insert(dependent, node);
            if start_needs(dependent) {
                // Back along the walk: `dependent` needs the node it was reached from, and so
                // on to `start`.
                let mut path = vec![start];
                let mut step = dependent;
                while step != start {
                    path.push(step);
                    step = reached_from[&step];
                }
                return Some(path);
            }
            queue.push_back(dependent);
        }
    }
    None
}

/// Every blocked node is in a cycle or depends on one; walking blocked dependencies from each
/// node not yet explained must revisit a node, and the loop from that node is a cycle.
fn find_cycles(
    dependencies: &[Vec<usize>],
    waiting_on: &[usize],
    blocked: &[usize],
) -> Vec<Vec<usize>> {
    let mut in_reported_cycle = vec![false; dependencies.len()];
    let mut cycles = Vec::new();
    for &start in blocked {
        if in_reported_cycle[start] {
            continue;
        }
        let mut position_in_path = HashMap::new();
        let mut path = Vec::new();
        let mut node = start;
        loop {
            if let Some(&position) = position_in_path.get(&node) {
                let cycle: Vec<usize> = path[position..].to_vec();
                if !cycle
                    .iter()
                    .any(|member: &usize| in_reported_cycle[*member])
                {
                    for member in &cycle {
                        in_reported_cycle[*member] = true;
                    }
                    cycles.push(cycle);
                }
                break;
            }
            if in_reported_cycle[node] {
                break;
            }
            position_in_path.insert(node, path.len());
            path.push(node);
            match dependencies[node]
                .iter()
                .find(|need| waiting_on[**need] > 0)
            {
                Some(next) => node = *next,
                None => break,
            }
        }
    }
    cycles
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dependencies_come_first() {
        // 0 needs 2, 2 needs 1.
        let order = dependency_order(&[vec![2], vec![], vec![1]]);
        assert_eq!(order.sequence, vec![1, 2, 0]);
        assert!(order.cycles.is_empty());
    }

    #[test]
    fn cycle_is_reported_once_and_dependents_blocked() {
        // 0 -> 1 -> 2 -> 0, and 3 depends on the cycle.
        let order = dependency_order(&[vec![1], vec![2], vec![0], vec![0], vec![]]);
        assert_eq!(order.sequence, vec![4]);
        assert_eq!(order.cycles, vec![vec![0, 1, 2]]);
        assert_eq!(order.blocked, vec![0, 1, 2, 3]);
    }

    /// The cycle through `start` in a graph given as needs, walked back through its inverse.
    fn cycle_in(dependencies: &[Vec<usize>], start: usize) -> Option<Vec<usize>> {
        shortest_cycle_through(
            start,
            |node, out| {
                out.extend(
                    (0..dependencies.len()).filter(|other| dependencies[*other].contains(&node)),
                )
            },
            |node| dependencies[start].contains(&node),
        )
    }

    #[test]
    fn the_shortest_cycle_through_a_node_is_named_from_it() {
        // 0 needs 3 and 1; 1 needs 0; 3 needs 2; 2 needs 1 and 0; 4 needs nothing.
        let dependencies = [vec![3, 1], vec![0], vec![1, 0], vec![2], vec![]];
        assert_eq!(cycle_in(&dependencies, 0), Some(vec![0, 1]));
        // 3 -> 2 -> 0 -> 3 is shorter than the way through 1.
        assert_eq!(cycle_in(&dependencies, 3), Some(vec![3, 2, 0]));
        assert_eq!(cycle_in(&dependencies, 4), None);
        assert_eq!(cycle_in(&[vec![0]], 0), Some(vec![0]));
        // A cycle elsewhere is not one through the start.
        assert_eq!(cycle_in(&[vec![1], vec![2], vec![1]], 0), None);
    }

    #[test]
    fn self_reference_is_a_cycle() {
        let order = dependency_order(&[vec![0]]);
        assert_eq!(order.cycles, vec![vec![0]]);
    }
}
