//! Dependency order: which definitions must be evaluated before which, and the cycles that make
//! an order impossible. Kahn's algorithm keeps this linear in the size of the sheet.

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

/// The shortest cycle through `start`, if there is one: the nodes from `start` along
/// dependencies, each needing the next and the last needing `start` (which is not repeated).
/// A breadth-first walk, so among cycles of equal length the one through earlier-listed
/// dependencies is named; it visits only what `start` depends on.
pub fn shortest_cycle_through(dependencies: &[Vec<usize>], start: usize) -> Option<Vec<usize>> {
    let mut reached_from: Vec<Option<usize>> = vec![None; dependencies.len()];
    let mut queue = std::collections::VecDeque::from([start]);
    while let Some(node) = queue.pop_front() {
        for &need in dependencies.get(node).into_iter().flatten() {
            if need == start {
                // Back along the walk to `start`, whose own entry is empty.
                let mut path = vec![node];
                let mut step = node;
                while let Some(previous) = reached_from[step] {
                    path.push(previous);
                    step = previous;
                }
                path.reverse();
                return Some(path);
            }
            if need < reached_from.len() && reached_from[need].is_none() {
                reached_from[need] = Some(node);
                queue.push_back(need);
            }
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
        let mut position_in_path = std::collections::HashMap::new();
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

    #[test]
    fn the_shortest_cycle_through_a_node_is_named_from_it() {
        // 0 needs 3 and 1; 1 needs 0; 3 needs 2; 2 needs 1 and 0; 4 needs nothing.
        let dependencies = [vec![3, 1], vec![0], vec![1, 0], vec![2], vec![]];
        assert_eq!(shortest_cycle_through(&dependencies, 0), Some(vec![0, 1]));
        // 3 -> 2 -> 0 -> 3 is shorter than the way through 1.
        assert_eq!(
            shortest_cycle_through(&dependencies, 3),
            Some(vec![3, 2, 0])
        );
        assert_eq!(shortest_cycle_through(&dependencies, 4), None);
        assert_eq!(shortest_cycle_through(&[vec![0]], 0), Some(vec![0]));
        // A cycle elsewhere is not one through the start.
        assert_eq!(
            shortest_cycle_through(&[vec![1], vec![2], vec![1]], 0),
            None
        );
    }

    #[test]
    fn self_reference_is_a_cycle() {
        let order = dependency_order(&[vec![0]]);
        assert_eq!(order.cycles, vec![vec![0]]);
    }
}
